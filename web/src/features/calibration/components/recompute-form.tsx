import { useState } from 'react';
import { RECOMPUTE_MAX_DAYS, recomputeSchema } from '@shared/schemas/calibration';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { formMessage, issuesToFieldErrors, type FieldErrors } from '../../../lib/form';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import { useRecomputeReadings } from '../api/recompute-readings';

type Props = { tankId: number; version: number; from: string; to: string; timeZone: string };

/** Optional: rewrite a period of stored readings with the new version (recorded in the audit log). */
export function RecomputeForm({ tankId, version, from, to, timeZone }: Props) {
  const [values, setValues] = useState({ from: isoToSiteLocal(from, timeZone), to: isoToSiteLocal(to, timeZone), reason: '' });
  const [errors, setErrors] = useState<FieldErrors>({});
  const recompute = useRecomputeReadings();
  const set = (k: keyof typeof values) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [k]: e.target.value }));
  const submit = () => {
    const parsed = recomputeSchema.safeParse({
      version, reason: values.reason, from: siteLocalToIso(values.from, timeZone) ?? '', to: siteLocalToIso(values.to, timeZone) ?? '',
    });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    recompute.mutate({ tankId, input: parsed.data });
  };
  return (
    <div className="flex flex-col gap-3 rounded-md border border-line bg-panel-2 p-3">
      <h4 className="font-semibold">Recompute stored readings with version {version} (optional)</h4>
      <p className="text-sm text-ink-muted">Rewrites the ratio of every reading of this tank in the period, at most {RECOMPUTE_MAX_DAYS} days at a time.</p>
      <FormError>{formMessage(recompute.error)}</FormError>
      {recompute.data && <Notice>{recompute.data.updated} readings now carry version {recompute.data.version}.</Notice>}
      <div className="grid gap-3 sm:grid-cols-3">
        <TextField label="From (site time)" type="datetime-local" value={values.from} onChange={set('from')} error={errors.from} />
        <TextField label="To (site time)" type="datetime-local" value={values.to} onChange={set('to')} error={errors.to} />
        <TextField label="Reason" value={values.reason} onChange={set('reason')} error={errors.reason} />
      </div>
      <div className="flex justify-end">
        <Button variant="danger" onClick={submit} disabled={recompute.isPending}>
          {recompute.isPending ? 'Recomputing…' : 'Recompute readings'}
        </Button>
      </div>
    </div>
  );
}
