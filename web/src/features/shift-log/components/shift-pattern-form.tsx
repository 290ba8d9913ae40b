import { useState } from 'react';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/panel';
import { formMessage, serverFieldErrors } from '../../../lib/form';
import { useShiftPattern } from '../api/get-shift-pattern';
import { useSaveShiftPattern } from '../api/save-shift-pattern';

/** Site setting (admin): two 12-hour or three 8-hour shifts and the first handover in site time. */
export function ShiftPatternForm() {
  const pattern = useShiftPattern();
  const save = useSaveShiftPattern();
  const [n, setN] = useState<string | null>(null);
  const [start, setStart] = useState<string | null>(null);
  if (!pattern.data) return null;
  const p = pattern.data;
  const errors = serverFieldErrors(save.error);
  const shifts = Number(n ?? p.shiftsPerDay) as 2 | 3;
  const first = start ?? p.firstStart;
  return (
    <Panel title="Shift pattern">
      <div className="grid items-end gap-3 sm:grid-cols-[1fr_10rem_auto]">
        <SelectField label="Shifts" value={String(shifts)} onChange={(e) => setN(e.target.value)} error={errors.shiftsPerDay}
          options={[{ value: '2', label: 'Two 12-hour shifts' }, { value: '3', label: 'Three 8-hour shifts' }]} />
        <TextField label={`First start (${p.timeZone})`} type="time" value={first} onChange={(e) => setStart(e.target.value)} error={errors.firstStart} />
        <Button variant="primary" disabled={save.isPending} onClick={() => save.mutate({ siteId: p.siteId, shiftsPerDay: shifts, firstStart: first })}>Save</Button>
      </div>
      <p className="mt-2 text-sm text-ink-muted">
        Handovers follow the site clock: across a daylight-saving change the shift that spans it is an hour shorter or longer.
        Shifts already written to keep their times.
      </p>
      {formMessage(save.error) && <p role="alert" className="text-sm font-medium text-attention-1-ink">{formMessage(save.error)}</p>}
    </Panel>
  );
}
