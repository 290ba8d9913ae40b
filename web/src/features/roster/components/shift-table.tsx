import { useState } from 'react';
import { ON_CALL_LABEL, type OnCallShiftView } from '@shared/schemas/roster';
import { Button } from '../../../components/ui/button';
import { formatDateTime } from '../../../lib/format';
import { useRemoveShift } from '../api/remove-shift';

/** Shifts in time order; the ones running now are marked; managers may remove one with a reason. */
export function ShiftTable({ shifts, timeZone, canManage, now }: { shifts: OnCallShiftView[]; timeZone: string; canManage: boolean; now: number }) {
  const remove = useRemoveShift();
  const [removing, setRemoving] = useState<number | null>(null);
  const [reason, setReason] = useState('');
  const removeControls = (s: OnCallShiftView) => (
    <>
      {canManage && removing !== s.id && <Button size="sm" variant="ghost" onClick={() => (setRemoving(s.id), setReason(''))}>Remove…</Button>}
      {removing === s.id && (
        <span className="inline-flex flex-wrap items-center gap-1">
          <input aria-label="Reason for removing" className="h-8 min-w-0 rounded border border-line-strong bg-panel px-2" value={reason} onChange={(e) => setReason(e.target.value)} placeholder="Reason" />
          <Button size="sm" variant="danger" disabled={reason.trim().length < 3 || remove.isPending} onClick={() => remove.mutate({ id: s.id, reason }, { onSuccess: () => setRemoving(null) })}>Remove</Button>
          <Button size="sm" variant="ghost" onClick={() => setRemoving(null)}>Cancel</Button>
        </span>
      )}
    </>
  );
  const isCurrent = (s: OnCallShiftView) => Date.parse(s.startsAt) <= now && now < Date.parse(s.endsAt);
  return (
    <>
      {/* Below 768 px a card per shift: a six-column table does not fit a phone. */}
      <ul className="flex flex-col gap-2 md:hidden" data-testid="shift-cards">
        {shifts.map((s) => (
          <li key={s.id} className={`rounded border border-line px-3 py-2 text-sm ${isCurrent(s) ? 'bg-panel-2 font-semibold' : ''}`}>
            <div className="tabular-nums">{isCurrent(s) && <span className="mr-1" aria-label="now">▶</span>}{formatDateTime(s.startsAt, timeZone)} – {formatDateTime(s.endsAt, timeZone)}</div>
            <div>{ON_CALL_LABEL[s.roleOnCall]}: {s.personName}</div>
            <div className="break-all text-ink-muted">{s.email}</div>
            {canManage && <div className="mt-1">{removeControls(s)}</div>}
          </li>
        ))}
      </ul>
      <div className="hidden overflow-x-auto md:block">
        <table className="w-full text-left text-sm" data-testid="shift-table">
          <thead className="text-xs text-ink-muted"><tr className="border-b border-line"><th className="py-2">From</th><th>To</th><th>Role</th><th>Person</th><th>E-mail</th><th /></tr></thead>
          <tbody>
            {shifts.map((s) => {
              const current = isCurrent(s);
              return (
                <tr key={s.id} className={`border-b border-line ${current ? 'bg-panel-2 font-semibold' : ''}`}>
                  <td className="whitespace-nowrap py-1.5 pr-3 tabular-nums">{current && <span className="mr-1" aria-label="now">▶</span>}{formatDateTime(s.startsAt, timeZone)}</td>
                  <td className="whitespace-nowrap pr-3 tabular-nums">{formatDateTime(s.endsAt, timeZone)}</td>
                  <td>{ON_CALL_LABEL[s.roleOnCall]}</td>
                  <td>{s.personName}</td>
                  <td className="break-all text-ink-muted">{s.email}</td>
                  <td className="text-right">{removeControls(s)}</td>
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </>
  );
}
