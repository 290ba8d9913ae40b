import { useState } from 'react';
import { addDays, localDateOf, zonedTimeToUtc } from '@shared/time/site-time';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { serverNow } from '../../../lib/clock';
import { formatDateTime } from '../../../lib/format';
import { useRecentShifts } from '../api/get-recent-shifts';
import type { DigestParams } from '../api/get-digest';

type Props = { timeZone: string; value: DigestParams; onChange: (p: DigestParams) => void };

const STATUS = { open: 'open', closed: 'handed over', upcoming: 'not started' } as const;

/** A shift from the recent list, or whole site-time days (midnight to midnight). */
export function ShiftPicker({ timeZone, value, onChange }: Props) {
  const shifts = useRecentShifts();
  const today = localDateOf(serverNow(), timeZone);
  const [fromDay, setFromDay] = useState(value.from ? localDateOf(Date.parse(value.from), timeZone) : addDays(today, -7));
  const [toDay, setToDay] = useState(value.to ? localDateOf(Date.parse(value.to) - 1, timeZone) : addDays(today, -1));
  const days = (from: string, to: string) => onChange({
    from: new Date(zonedTimeToUtc(from, 0, timeZone)).toISOString(),
    to: new Date(zonedTimeToUtc(addDays(to, 1), 0, timeZone)).toISOString(),
  });
  const options = [
    { value: '', label: 'Last handed-over shift' },
    ...(shifts.data?.shifts ?? []).map((s) => ({
      value: s.startsAt,
      label: `${formatDateTime(s.startsAt, timeZone)}–${formatDateTime(s.endsAt, timeZone).slice(11)} · ${STATUS[s.status]}`,
    })),
  ];
  return (
    <div className="flex flex-wrap items-end gap-3 print:hidden">
      <div className="w-80">
        <SelectField label="Shift" options={options} value={value.from ? '' : (value.shiftStart ?? '')}
          onChange={(e) => onChange(e.target.value ? { shiftStart: e.target.value } : {})} />
      </div>
      <span className="pb-2 text-ink-muted">or days</span>
      <div className="w-40">
        <TextField label="From (site date)" type="date" value={fromDay} max={toDay} onChange={(e) => setFromDay(e.target.value)} />
      </div>
      <div className="w-40">
        <TextField label="To (site date)" type="date" value={toDay} min={fromDay} max={today} onChange={(e) => setToDay(e.target.value)} />
      </div>
      <Button onClick={() => days(fromDay, toDay)} disabled={!fromDay || !toDay || fromDay > toDay}>Show days</Button>
      <Button variant="ghost" onClick={() => days(addDays(today, -7), addDays(today, -1))}>Last 7 days</Button>
    </div>
  );
}
