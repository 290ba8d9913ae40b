import { useState, type FormEvent } from 'react';
import { shelveSchema } from '@shared/schemas/alarms';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useShelveAlarm } from '../api/shelve-alarm';

const DURATIONS = [15, 30, 60, 120, 240, 480, 720].map((m) => ({ value: String(m), label: m < 60 ? `${m} min` : `${m / 60} h` }));

/** Shelve needs a reason and an end (at most the site's longest shelve): the alarm comes back on its own when it ends. */
export function ShelveForm({ alarmId, maxHours, onDone }: { alarmId: number; maxHours: number; onDone: () => void }) {
  const durations = DURATIONS.filter((d) => Number(d.value) <= maxHours * 60);
  const shelve = useShelveAlarm();
  const [reason, setReason] = useState('');
  const [minutes, setMinutes] = useState(() => String(Math.min(60, Number(durations.at(-1)?.value ?? 15))));
  const [errors, setErrors] = useState<FieldErrors>({});

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = shelveSchema.safeParse({ reason, durationMin: Number(minutes) });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    shelve.mutate({ id: alarmId, input: parsed.data }, { onSuccess: onDone });
  };
  const server = serverFieldErrors(shelve.error);
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Shelve alarm">
      <TextField label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} error={errors.reason ?? server.reason} maxLength={500} hint="Shown in the history and to the next shift" />
      <SelectField label="Shelve for" value={minutes} onChange={(e) => setMinutes(e.target.value)} options={durations} error={errors.durationMin ?? server.durationMin ?? server.until} />
      <FormError>{formMessage(shelve.error)}</FormError>
      <div className="flex justify-end gap-2">
        <Button variant="ghost" onClick={onDone}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={shelve.isPending}>Shelve</Button>
      </div>
    </form>
  );
}
