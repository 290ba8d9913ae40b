import type { AlarmFigures, AlarmSpan } from '@shared/schemas/digest';
import { formatDateTime } from '../../../lib/format';
import { AlarmTimeline } from './alarm-timeline';
import { alarmKindLabel, formatSeconds } from './digest-format';
import { DigestTable, type Column } from './digest-table';

type Props = { alarms: AlarmFigures; fromMs: number; toMs: number; timeZone: string; csvHref: string };

function Figure({ label, value }: { label: string; value: string }) {
  return (
    <div className="rounded-md border border-line px-3 py-2">
      <div className="text-xs text-ink-muted">{label}</div>
      <div className="text-xl font-bold tabular-nums">{value}</div>
    </div>
  );
}

/** Alarm counts, response times and the timeline; one row per alarm in the table. */
export function AlarmSection({ alarms, fromMs, toMs, timeZone, csvHref }: Props) {
  const at = (iso: string | null) => (iso ? formatDateTime(iso, timeZone) : '—');
  const ackS = (a: AlarmSpan) => (a.acknowledgedAt ? (Date.parse(a.acknowledgedAt) - Date.parse(a.raisedAt)) / 1000 : null);
  const columns: Column<AlarmSpan>[] = [
    { header: 'Priority', cell: (a) => <span className="font-bold">P{a.priority}</span> },
    { header: 'Tank', cell: (a) => a.tankTag },
    { header: 'Alarm', cell: (a) => alarmKindLabel(a.kind) },
    { header: 'Raised', cell: (a) => at(a.raisedAt) },
    { header: 'Acknowledged', cell: (a) => at(a.acknowledgedAt) },
    { header: 'Time to acknowledge', numeric: true, cell: (a) => formatSeconds(ackS(a)) },
    { header: 'Shelved', cell: (a) => at(a.shelvedAt) },
    { header: 'Cleared', cell: (a) => at(a.clearedAt) },
  ];
  if (!alarms.available) {
    return <DigestTable title="Alarms" csvHref={csvHref} columns={columns} rows={[]} empty="Alarm records are not available on this server yet." />;
  }
  return (
    <DigestTable title="Alarms" csvHref={csvHref} columns={columns} rows={alarms.timeline} empty="No alarms in this period.">
      <div className="grid grid-cols-3 gap-2 md:grid-cols-7 print:grid-cols-7" data-testid="alarm-figures">
        <Figure label="Raised" value={String(alarms.raised)} />
        <Figure label="Acknowledged" value={String(alarms.acknowledged)} />
        <Figure label="Not acknowledged" value={String(alarms.waiting)} />
        <Figure label="Shelved" value={String(alarms.shelved)} />
        <Figure label="Escalations sent" value={String(alarms.escalationsSent)} />
        <Figure label="Mean time to ack." value={formatSeconds(alarms.ackMeanS)} />
        <Figure label="Longest time to ack." value={formatSeconds(alarms.ackMaxS)} />
      </div>
      {alarms.timeline.length > 0 && <AlarmTimeline alarms={alarms.timeline} fromMs={fromMs} toMs={toMs} timeZone={timeZone} />}
    </DigestTable>
  );
}
