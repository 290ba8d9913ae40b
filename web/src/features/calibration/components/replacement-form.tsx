import { useState, type FormEvent } from 'react';
import { REPLACED_PARTS, REPLACED_PART_LABELS, probeReplacementSchema } from '@shared/schemas/probe-checks';
import { Button } from '../../../components/ui/button';
import { CautionNote } from '../../../components/ui/caution-note';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import { useRecordProbeReplacement } from '../api/record-probe-replacement';

export const PROBE_WORK_CAUTION =
  'Before a probe comes out: electrical isolation and lock-out, hot acidic slurry, acid mist, and hydrogen sulfide where acid meets sulfides. Work to the site procedure and permit-to-work.';

/** Logs a replacement; the probe is then due for a check at once. */
export function ReplacementForm({ probeId, probeTag, timeZone, onDone }: { probeId: number; probeTag: string; timeZone: string; onDone: () => void }) {
  const [v, setV] = useState(() => ({ part: 'reference', replacedAt: isoToSiteLocal(Date.now(), timeZone), reason: '', note: '' }));
  const [errors, setErrors] = useState<FieldErrors>({});
  const record = useRecordProbeReplacement();
  const server = serverFieldErrors(record.error);
  const set = (k: keyof typeof v) => (e: { target: { value: string } }) => setV((x) => ({ ...x, [k]: e.target.value }));
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = probeReplacementSchema.safeParse({ ...v, probeId, replacedAt: siteLocalToIso(v.replacedAt, timeZone) ?? '', note: v.note || undefined });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    record.mutate(parsed.data, { onSuccess: onDone });
  };
  return (
    <form onSubmit={submit} noValidate aria-label={`Log a replacement on ${probeTag}`} className="flex flex-col gap-3">
      <CautionNote>{PROBE_WORK_CAUTION}</CautionNote>
      <FormError>{formMessage(record.error)}</FormError>
      <div className="grid gap-3 sm:grid-cols-2">
        <SelectField label="What was replaced" value={v.part} onChange={set('part')} options={REPLACED_PARTS.map((p) => ({ value: p, label: REPLACED_PART_LABELS[p] }))} />
        <TextField label="When (site time)" type="datetime-local" value={v.replacedAt} onChange={set('replacedAt')} error={errors.replacedAt ?? server.replacedAt} />
        <TextField label="Reason" value={v.reason} onChange={set('reason')} error={errors.reason ?? server.reason} />
        <TextField label="Note (serial number, batch…)" value={v.note} onChange={set('note')} />
      </div>
      <div className="flex justify-end gap-3">
        <Button onClick={onDone}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={record.isPending}>Log replacement</Button>
      </div>
    </form>
  );
}
