import type { ShiftLogEntryView, ShiftView } from '@shared/schemas/shifts';
import { formatDateTime } from '../../../lib/format';
import { DigestTable, type Column } from './digest-table';

type Props = { entries: ShiftLogEntryView[]; shift: ShiftView | null; timeZone: string; csvHref: string };

/** The shift log as written, corrections marked, and the handover note that closed the shift. */
export function LogSection({ entries, shift, timeZone, csvHref }: Props) {
  const columns: Column<ShiftLogEntryView>[] = [
    { header: 'When', cell: (e) => <span className="whitespace-nowrap tabular-nums">{formatDateTime(e.at, timeZone)}</span> },
    { header: 'Who', cell: (e) => e.author.name },
    { header: 'Tank', cell: (e) => e.tank?.tag ?? '' },
    {
      header: 'Entry',
      cell: (e) => (
        <span className="whitespace-pre-wrap">
          {e.correctsId && <span className="mr-1 font-semibold">Correction of #{e.correctsId}:</span>}
          {e.body}
          {e.editedAt && <span className="ml-1 text-xs text-ink-muted">(reworded before handover)</span>}
        </span>
      ),
    },
  ];
  return (
    <DigestTable title="Shift log" csvHref={csvHref} columns={columns} rows={entries} empty="Nothing was written in the log.">
      {shift?.status === 'closed' && shift.handoverNote && (
        <blockquote className="rounded-md border-l-4 border-ink bg-panel-2 px-3 py-2" data-testid="handover-note">
          <div className="text-xs font-semibold text-ink-muted">
            Handover note · {shift.closedBy?.name} · {shift.closedAt ? formatDateTime(shift.closedAt, timeZone) : ''}
          </div>
          <p className="mt-1 whitespace-pre-wrap">{shift.handoverNote}</p>
        </blockquote>
      )}
    </DigestTable>
  );
}
