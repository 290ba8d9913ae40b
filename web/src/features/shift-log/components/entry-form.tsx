import { useState, type FormEvent } from 'react';
import type { ShiftLogEntryView } from '@shared/schemas/shifts';
import { Button } from '../../../components/ui/button';
import { SelectField, TextAreaField, TextField } from '../../../components/ui/field';
import { formMessage, serverFieldErrors } from '../../../lib/form';
import { useAddEntry } from '../api/add-entry';

export type TankOption = { id: number; tag: string };

type Props = { tanks: TankOption[]; correcting: ShiftLogEntryView | null; onDone: () => void };

/** A new entry, optionally about a tank or an alarm; or a correction of an earlier entry. */
export function EntryForm({ tanks, correcting, onDone }: Props) {
  const add = useAddEntry();
  const [body, setBody] = useState('');
  const [tankId, setTankId] = useState('');
  const [alarmId, setAlarmId] = useState('');
  const errors = serverFieldErrors(add.error);

  const submit = (e: FormEvent) => {
    e.preventDefault();
    add.mutate(
      { body, tankId: tankId ? Number(tankId) : null, alarmId: alarmId ? Number(alarmId) : null, correctsId: correcting?.id ?? null },
      { onSuccess: () => { setBody(''); setAlarmId(''); onDone(); } },
    );
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label={correcting ? 'Correct an entry' : 'New log entry'}>
      {correcting && (
        <p className="rounded-md border-l-4 border-line-strong bg-panel-2 px-3 py-1.5 text-sm">
          Correcting #{correcting.id} by {correcting.author.name}: “{correcting.body}”. The original stays as written.
        </p>
      )}
      <TextAreaField label={correcting ? 'Correction' : 'Entry'} value={body} onChange={(e) => setBody(e.target.value)} maxLength={4000} error={errors.body} required />
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField label="Tank (optional)" value={tankId} onChange={(e) => setTankId(e.target.value)} error={errors.tankId}
          options={[{ value: '', label: '—' }, ...tanks.map((t) => ({ value: String(t.id), label: t.tag }))]} />
        <TextField label="Alarm number (optional)" inputMode="numeric" value={alarmId} onChange={(e) => setAlarmId(e.target.value.replace(/\D/g, ''))} error={errors.alarmId} />
      </div>
      {formMessage(add.error) && <p role="alert" className="text-sm font-medium text-attention-1-ink">{formMessage(add.error)}</p>}
      <div className="flex justify-end gap-2">
        {correcting && <Button onClick={onDone}>Cancel</Button>}
        <Button type="submit" variant="primary" disabled={add.isPending || !body.trim()}>{correcting ? 'Add correction' : 'Add entry'}</Button>
      </div>
    </form>
  );
}
