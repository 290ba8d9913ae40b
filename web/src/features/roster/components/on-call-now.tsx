import { Link } from 'react-router-dom';
import { ON_CALL_LABEL, ON_CALL_ROLES } from '@shared/schemas/roster';
import { useOnCall } from '../api/get-on-call';

/** Who is rostered this minute, by role; `compact` for the header. Nobody in a role is said out loud. */
export function OnCallNow({ compact = false, rosterPath }: { compact?: boolean; rosterPath?: string }) {
  const q = useOnCall();
  const shifts = q.data?.shifts ?? [];
  if (compact) {
    const primary = shifts.find((s) => s.roleOnCall === 'primary');
    const text = primary ? `First call: ${primary.personName}` : q.data ? 'Nobody rostered' : '';
    return rosterPath ? <Link to={rosterPath} className="hidden max-w-[14rem] truncate text-sm text-ink-muted hover:text-ink 2xl:inline" data-testid="on-call-header">{text}</Link> : <span className="text-sm">{text}</span>;
  }
  return (
    <div className="flex flex-wrap items-center gap-x-4 gap-y-1 text-sm" aria-label="Rostered this hour" data-testid="on-call-now">
      <span className="font-semibold">Rostered this hour</span>
      {ON_CALL_ROLES.map((role) => {
        const people = shifts.filter((s) => s.roleOnCall === role);
        return (
          <span key={role}>
            <span className="text-ink-muted">{ON_CALL_LABEL[role]}:</span>{' '}
            {people.length ? people.map((p) => p.personName).join(', ') : <span className="font-semibold text-attention-2-ink">nobody</span>}
          </span>
        );
      })}
    </div>
  );
}
