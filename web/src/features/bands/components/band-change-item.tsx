import { useState } from 'react';
import type { Role, SessionUser } from '@shared/schemas/auth';
import type { BandChange, BandValues } from '@shared/schemas/bands';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { formatDateTime, formatRatio } from '../../../lib/format';
import { formMessage } from '../../../lib/form';
import { useDecideBandChange } from '../api/decide-band-change';

const DECIDERS: readonly Role[] = ['supervisor', 'metallurgist'];
const CHANGERS: readonly Role[] = ['metallurgist', 'admin'];
const STATUS: Record<BandChange['status'], string> = {
  applied: 'Applied', pending: 'Awaiting approval', approved: 'Approved', rejected: 'Rejected', withdrawn: 'Withdrawn',
};

export const bandText = (b: BandValues) => `${formatRatio(b.low)}–${formatRatio(b.high)}${b.target != null ? ` (target ${formatRatio(b.target)})` : ''}`;

/** One change: old → new, who, when, why, and for a pending one the decisions the viewer may take. */
export function BandChangeItem({ change, user, timeZone, onChanged }: { change: BandChange; user: SessionUser; timeZone: string; onChanged?: () => void }) {
  const when = (iso: string) => formatDateTime(iso, timeZone);
  const decide = useDecideBandChange(onChanged);
  const [rejecting, setRejecting] = useState(false);
  const [note, setNote] = useState('');
  const own = change.requestedBy.id === user.id;
  const pending = change.status === 'pending';
  const canDecide = pending && !own && DECIDERS.includes(user.role);
  const canWithdraw = pending && own && CHANGERS.includes(user.role);

  return (
    <li className="flex flex-col gap-2 border-b border-line py-3 last:border-b-0">
      <div className="flex flex-wrap items-baseline gap-x-3 gap-y-1">
        <span className="font-bold">{change.tankTag}</span>
        <span className="tabular-nums">
          {bandText(change.old)} <span aria-hidden="true">→</span>
          <span className="sr-only">to</span> <strong>{bandText(change.new)}</strong>
        </span>
        <span className={pending ? 'rounded-sm border border-line-strong px-1.5 font-semibold' : 'text-ink-muted'}>
          {pending && <span aria-hidden="true">◷ </span>}
          {STATUS[change.status]}
        </span>
      </div>
      {change.cumulativeFrom && (
        <p className="text-sm" data-testid="band-cumulative">
          With the changes since {when(change.cumulativeFrom.since)}: <span className="tabular-nums">{bandText(change.cumulativeFrom.band)}</span>{' '}
          <span aria-hidden="true">→</span>
          <span className="sr-only">to</span> <strong className="tabular-nums">{bandText(change.new)}</strong>
          {change.needsApproval && ' (judged as one change)'}
        </p>
      )}
      <p className="text-sm text-ink-muted">
        “{change.reason}” — {change.requestedBy.name}, {when(change.requestedAt)}
        {change.copiedFromTankId != null && ' · copied within the circuit'}
      </p>
      {change.decision && (
        <p className="text-sm text-ink-muted">
          {STATUS[change.status]} by {change.decision.by.name}, {when(change.decision.at)}
          {change.decision.note && ` — “${change.decision.note}”`}
        </p>
      )}
      <FormError>{formMessage(decide.error)}</FormError>
      {rejecting ? (
        <div className="flex flex-col gap-2 sm:flex-row sm:items-end">
          <div className="flex-1">
            <TextField label="Why is it rejected?" value={note} onChange={(e) => setNote(e.target.value)} />
          </div>
          <Button onClick={() => setRejecting(false)}>Cancel</Button>
          <Button variant="danger" disabled={note.trim().length < 3 || decide.isPending} onClick={() => decide.mutate({ id: change.id, decision: 'reject', note })}>
            Reject change
          </Button>
        </div>
      ) : (
        (canDecide || canWithdraw) && (
          <div className="flex justify-end gap-2">
            {canWithdraw && (
              <Button size="sm" onClick={() => decide.mutate({ id: change.id, decision: 'withdraw' })} disabled={decide.isPending}>
                Withdraw
              </Button>
            )}
            {canDecide && (
              <>
                <Button size="sm" onClick={() => setRejecting(true)}>Reject…</Button>
                <Button size="sm" variant="primary" onClick={() => decide.mutate({ id: change.id, decision: 'approve' })} disabled={decide.isPending}>
                  Approve
                </Button>
              </>
            )}
          </div>
        )
      )}
    </li>
  );
}
