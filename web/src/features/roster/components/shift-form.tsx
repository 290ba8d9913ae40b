import { useState, type FormEvent } from 'react';
import { ON_CALL_LABEL, ON_CALL_ROLES, shiftSchema } from '@shared/schemas/roster';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { useNow } from '../../../lib/clock';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import { useCreateShift } from '../api/create-shift';

/** Add one shift; times are entered in site time. */
export function ShiftForm({ timeZone }: { timeZone: string }) {
  const create = useCreateShift();
  const now = useNow();
  const [f, setF] = useState(() => {
    const start = Math.ceil(now / 3_600_000) * 3_600_000;
    return { personName: '', email: '', roleOnCall: 'primary', startsAt: isoToSiteLocal(start, timeZone), endsAt: isoToSiteLocal(start + 12 * 3_600_000, timeZone) };
  });
  const [errors, setErrors] = useState<FieldErrors>({});
  const set = (k: keyof typeof f) => (e: { target: { value: string } }) => setF({ ...f, [k]: e.target.value });

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = shiftSchema.safeParse({ ...f, startsAt: siteLocalToIso(f.startsAt, timeZone) ?? '', endsAt: siteLocalToIso(f.endsAt, timeZone) ?? '' });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    create.mutate(parsed.data, { onSuccess: () => setF({ ...f, personName: '', email: '' }) });
  };
  const err = { ...serverFieldErrors(create.error), ...errors };
  return (
    <form onSubmit={submit} className="grid grid-cols-1 gap-3 sm:grid-cols-2" aria-label="Add a shift">
      <TextField label="Person" value={f.personName} onChange={set('personName')} error={err.personName} />
      <TextField label="E-mail" type="email" value={f.email} onChange={set('email')} error={err.email} />
      <SelectField label="Role on call" value={f.roleOnCall} onChange={set('roleOnCall')} options={ON_CALL_ROLES.map((r) => ({ value: r, label: ON_CALL_LABEL[r] }))} />
      <div />
      <TextField label={`Starts (${timeZone})`} type="datetime-local" value={f.startsAt} onChange={set('startsAt')} error={err.startsAt} />
      <TextField label="Ends" type="datetime-local" value={f.endsAt} onChange={set('endsAt')} error={err.endsAt} />
      <div className="sm:col-span-2"><FormError>{formMessage(create.error)}</FormError></div>
      <div className="flex justify-end sm:col-span-2"><Button type="submit" variant="primary" disabled={create.isPending}>Add shift</Button></div>
    </form>
  );
}
