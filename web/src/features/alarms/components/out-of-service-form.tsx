import { useState, type FormEvent } from 'react';
import { oosSchema } from '@shared/schemas/alarms';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useRemoveFromService } from '../api/remove-from-service';

const PERIODS = [[1, '1 h'], [4, '4 h'], [8, '8 h'], [12, '12 h'], [24, '24 h'], [72, '3 days'], [168, '7 days']].map(([h, label]) => ({ value: String(h), label: String(label) }));

/** The usual reason is a probe pulled for cleaning or a check, so the form carries the cautions for that work. */
export function ProbeRemovalCaution() {
  return (
    <section aria-label="Before removing a probe" className="rounded-md border border-line bg-panel-2 p-3 text-sm" data-testid="probe-removal-caution">
      <h4 className="font-semibold"><span aria-hidden="true">! </span>Before removing a probe</h4>
      <ul className="mt-1 list-disc pl-5">
        <li>Isolate and lock out the probe and its transmitter as your site requires.</li>
        <li>Leach tanks hold hot, acidic slurry: expect splashes and wear the protection your procedure calls for.</li>
        <li>Acid mist, and hydrogen sulfide where acid meets sulfides, can collect around open ports.</li>
      </ul>
      <p className="mt-2 text-ink-muted">Follow your site&apos;s procedures and permit-to-work; this note does not replace them.</p>
    </section>
  );
}

/** Out of service needs a reason and a period: the alarm returns to service on its own when the period ends. */
export function OutOfServiceForm({ definitionId, onDone }: { definitionId: number; onDone: (saved: boolean) => void }) {
  const oos = useRemoveFromService();
  const [reason, setReason] = useState('');
  const [hours, setHours] = useState('4');
  const [errors, setErrors] = useState<FieldErrors>({});
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = oosSchema.safeParse({ reason, durationH: Number(hours) });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    oos.mutate({ definitionId, input: parsed.data }, { onSuccess: () => onDone(true) });
  };
  const server = serverFieldErrors(oos.error);
  return (
    <form onSubmit={submit} className="flex flex-col gap-3" aria-label="Take out of service">
      <ProbeRemovalCaution />
      <TextField label="Reason" value={reason} onChange={(e) => setReason(e.target.value)} maxLength={500} error={errors.reason ?? server.reason}
        hint="For example: probe pulled for cleaning. The alarm stays silent until the period ends or it is returned to service." />
      <SelectField label="Out of service for" value={hours} onChange={(e) => setHours(e.target.value)} options={PERIODS} error={errors.durationH ?? server.durationH} />
      <FormError>{formMessage(oos.error)}</FormError>
      <div className="flex justify-end gap-2">
        <Button variant="ghost" onClick={() => onDone(false)}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={oos.isPending}>Take out of service</Button>
      </div>
    </form>
  );
}
