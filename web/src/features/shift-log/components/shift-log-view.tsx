import { useState } from 'react';
import { Link } from 'react-router-dom';
import type { SessionUser } from '@shared/schemas/auth';
import type { ShiftLogEntryView, ShiftView } from '@shared/schemas/shifts';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { Notice } from '../../../components/ui/notice';
import { Panel } from '../../../components/ui/panel';
import { formatDateTime } from '../../../lib/format';
import { useShiftLog } from '../api/get-shift-log';
import { EntryForm, type TankOption } from './entry-form';
import { EntryItem } from './entry-item';
import { HandoverForm } from './handover-form';
import { ShiftPatternForm } from './shift-pattern-form';

const range = (s: ShiftView, tz: string) => `${formatDateTime(s.startsAt, tz)} → ${formatDateTime(s.endsAt, tz).slice(11)}`;

/** The shift log of the shift now being written, the last handover above it, and the supervisor's handover below. */
export function ShiftLogView({ tanks, user }: { tanks: TankOption[]; user: SessionUser }) {
  const current = useShiftLog();
  const previousAt = current.data ? new Date(Date.parse(current.data.shift.startsAt) - 1).toISOString() : '';
  const previous = useShiftLog(previousAt);
  const [correcting, setCorrecting] = useState<ShiftLogEntryView | null>(null);
  const [closed, setClosed] = useState<ShiftView | null>(null);

  if (current.isPending) return <Loading label="Loading the shift log…" />;
  if (current.isError) return <ErrorState title="The shift log could not be loaded" detail={current.error.message} onRetry={() => current.refetch()} />;
  const { shift, entries, timeZone: tz } = current.data;
  const prev = previous.data?.shift;

  return (
    <div className="mx-auto flex max-w-4xl flex-col gap-4">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1 className="text-2xl font-bold">Shift log</h1>
          <p className="tabular-nums text-ink-muted">
            {shift.status === 'upcoming' ? 'Next shift' : 'This shift'}: {range(shift, tz)} site time
          </p>
        </div>
        <Link to="/readings" className="text-info-ink underline">Readings in and out</Link>
      </div>
      {closed && (
        <Notice tone="info">
          Shift handed over. <Link className="underline" to={`/shift-digest?shift=${encodeURIComponent(closed.startsAt)}`}>Open its digest to print</Link>.
        </Notice>
      )}
      {prev?.status === 'closed' && prev.handoverNote && (
        <Panel title={`Handover from the last shift (${range(prev, tz)})`}>
          <p className="whitespace-pre-wrap" data-testid="previous-handover">{prev.handoverNote}</p>
          <p className="mt-1 text-sm text-ink-muted">{prev.closedBy?.name} · {prev.closedAt ? formatDateTime(prev.closedAt, tz) : ''}</p>
        </Panel>
      )}
      <Panel title={correcting ? 'Correct an entry' : 'Write in the log'}>
        <EntryForm key={correcting?.id ?? 'new'} tanks={tanks} correcting={correcting} onDone={() => setCorrecting(null)} />
      </Panel>
      <Panel title={`Entries (${entries.length})`}>
        {entries.length === 0 ? <p className="text-ink-muted">Nothing written yet in this shift.</p> : (
          <ol>
            {[...entries].reverse().map((e) => (
              <EntryItem key={e.id} entry={e} timeZone={tz} mine={e.author.id === user.id} open={shift.status !== 'closed'} onCorrect={setCorrecting} />
            ))}
          </ol>
        )}
        <p className="mt-2 text-xs text-ink-muted">Refreshes every minute.</p>
      </Panel>
      {user.role === 'supervisor' && shift.status === 'open' && (
        <Panel title="Hand over this shift">
          <HandoverForm shift={shift} onClosed={setClosed} />
        </Panel>
      )}
      {user.role === 'admin' && <ShiftPatternForm />}
    </div>
  );
}
