import { useState } from 'react';
import { checkIntervalSchema } from '@shared/schemas/probe-checks';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { formMessage, issuesToFieldErrors, type FieldErrors } from '../../../lib/form';
import { useSetCheckInterval } from '../api/set-check-interval';

/** The probe's own check interval (instead of the site default), with a reason. */
export function IntervalForm({ probeId, current, onDone }: { probeId: number; current: number; onDone: () => void }) {
  const [v, setV] = useState({ intervalDays: String(current), reason: '' });
  const [errors, setErrors] = useState<FieldErrors>({});
  const save = useSetCheckInterval();
  const submit = () => {
    const parsed = checkIntervalSchema.safeParse({ intervalDays: Number(v.intervalDays.replace(',', '.')), reason: v.reason });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    save.mutate({ probeId, ...parsed.data }, { onSuccess: onDone });
  };
  return (
    <div className="flex flex-col gap-3">
      <FormError>{formMessage(save.error)}</FormError>
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Check every" inputMode="decimal" unit="days" value={v.intervalDays} onChange={(e) => setV({ ...v, intervalDays: e.target.value })} error={errors.intervalDays} />
        <TextField label="Reason" value={v.reason} onChange={(e) => setV({ ...v, reason: e.target.value })} error={errors.reason} />
      </div>
      <div className="flex justify-end gap-3">
        <Button onClick={onDone}>Cancel</Button>
        <Button variant="primary" onClick={submit} disabled={save.isPending}>Save interval</Button>
      </div>
    </div>
  );
}
