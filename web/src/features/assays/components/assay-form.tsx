import { useState, type FormEvent } from 'react';
import { ASSAY_UNITS, assayEntrySchema } from '@shared/schemas/assays';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { ApiError } from '../../../lib/api-client';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import { useCreateAssay } from '../api/create-assay';
import { tankOptions, type TankOption } from './tank-option';

const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));

/** One lab result typed in by hand; sampling time is entered in site time. */
export function AssayForm({ tanks, timeZone, defaultTankId }: { tanks: TankOption[]; timeZone: string; defaultTankId?: number }) {
  const [values, setValues] = useState(() => ({
    tankId: String(defaultTankId ?? tanks[0]?.id ?? ''), sampledAt: isoToSiteLocal(Date.now(), timeZone), fe2: '', feTotal: '', unit: 'g/L',
    method: 'dichromate titration', analyst: '', labRef: '', note: '',
  }));
  const [errors, setErrors] = useState<FieldErrors>({});
  const [stored, setStored] = useState<string | null>(null);
  const create = useCreateAssay();
  const duplicate = create.error instanceof ApiError && create.error.status === 409;
  const server: FieldErrors = { ...serverFieldErrors(create.error), ...(duplicate ? { sampledAt: create.error?.message } : {}) };
  const set = (k: keyof typeof values) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [k]: e.target.value }));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = assayEntrySchema.safeParse({
      ...values, tankId: Number(values.tankId), sampledAt: siteLocalToIso(values.sampledAt, timeZone) ?? '', fe2: num(values.fe2), feTotal: num(values.feTotal),
    });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: (a) => {
        setStored(`Stored: ${a.tankTag} at ${values.sampledAt.replace('T', ' ')} (site time).`);
        setValues((v) => ({ ...v, fe2: '', feTotal: '', labRef: '', note: '' }));
      },
    });
  };

  return (
    <form onSubmit={submit} noValidate aria-label="Enter an assay" className="flex flex-col gap-4">
      {!duplicate && <FormError>{formMessage(create.error)}</FormError>}
      {stored && !create.error && <Notice>{stored}</Notice>}
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <SelectField label="Tank" value={values.tankId} onChange={set('tankId')} options={tankOptions(tanks)} error={errors.tankId ?? server.tankId} />
        <TextField label="Sampling time (site time)" type="datetime-local" value={values.sampledAt} onChange={set('sampledAt')} error={errors.sampledAt ?? server.sampledAt} />
        <TextField label="Fe²⁺" inputMode="decimal" unit={values.unit} value={values.fe2} onChange={set('fe2')} error={errors.fe2 ?? server.fe2} />
        <TextField label="Total Fe" inputMode="decimal" unit={values.unit} value={values.feTotal} onChange={set('feTotal')} error={errors.feTotal ?? server.feTotal} />
        <SelectField label="Unit" value={values.unit} onChange={set('unit')} options={ASSAY_UNITS.map((u) => ({ value: u, label: u }))} error={errors.unit} hint="mol/L is converted with Fe 55.845 g/mol" />
        <TextField label="Method" value={values.method} onChange={set('method')} error={errors.method ?? server.method} />
        <TextField label="Analyst" value={values.analyst} onChange={set('analyst')} error={errors.analyst ?? server.analyst} />
        <TextField label="Lab reference" value={values.labRef} onChange={set('labRef')} error={errors.labRef ?? server.labRef} />
      </div>
      <TextField label="Note" value={values.note} onChange={set('note')} error={errors.note ?? server.note} />
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={create.isPending}>
          {create.isPending ? 'Storing…' : 'Store assay'}
        </Button>
      </div>
    </form>
  );
}
