import { useState, type FormEvent } from 'react';
import { ratioToOrpMv } from '@shared/redox';
import { bandChangeSchema, isLargeBandChange, type BandRow } from '@shared/schemas/bands';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { formatMv, formatRatio, formatTempC } from '../../../lib/format';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useChangeBand } from '../api/change-band';

const toNumber = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));

/** The mV a ratio would read on this tank's probe now, or null when it cannot be said. */
function mvOf(row: BandRow, ratio: number): string | null {
  if (!row.mv || !(ratio > 0)) return null;
  try {
    return formatMv(ratioToOrpMv({ ...row.mv.conditions, ratio }));
  } catch {
    return null;
  }
}

type Props = { row: BandRow; approvalFactor: number; onDone: () => void; onChanged?: () => void };

/** Change one tank's band; a reason is required, and a large move is flagged before it is sent. */
export function BandChangeForm({ row, approvalFactor, onDone, onChanged }: Props) {
  const [values, setValues] = useState({
    low: String(row.band.low), high: String(row.band.high), target: row.band.target == null ? '' : String(row.band.target), reason: '',
  });
  const [errors, setErrors] = useState<FieldErrors>({});
  const change = useChangeBand(onChanged);
  const server = serverFieldErrors(change.error);
  const set = (k: keyof typeof values) => (e: { target: { value: string } }) => setValues((v) => ({ ...v, [k]: e.target.value }));
  const next = { low: toNumber(values.low), high: toNumber(values.high), target: values.target.trim() === '' ? null : toNumber(values.target) };
  const large = next.low > 0 && next.high > 0 && isLargeBandChange(row.band, next, approvalFactor);
  const mvHint = (r: number | null) => {
    const mv = r == null ? null : mvOf(row, r);
    return mv && row.mv ? `${mv} mV at ${formatTempC(row.mv.tempC)} °C` : undefined;
  };

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = bandChangeSchema.safeParse({ ...next, reason: values.reason });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    change.mutate({ tankId: row.tankId, input: parsed.data }, { onSuccess: onDone });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={`Change band of ${row.tankTag}`} className="flex flex-col gap-4">
      <h3 className="font-bold">
        Change band of {row.tankTag} <span className="font-normal text-ink-muted">(now {formatRatio(row.band.low)}–{formatRatio(row.band.high)})</span>
      </h3>
      <FormError>{formMessage(change.error)}</FormError>
      <div className="grid gap-4 sm:grid-cols-3">
        <TextField label="Low ratio" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.low} onChange={set('low')} error={errors.low ?? server.low} hint={mvHint(next.low)} />
        <TextField label="High ratio" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.high} onChange={set('high')} error={errors.high ?? server.high} hint={mvHint(next.high)} />
        <TextField label="Target (optional)" inputMode="decimal" unit="Fe³⁺/Fe²⁺" value={values.target} onChange={set('target')} error={errors.target ?? server.target} hint={mvHint(next.target)} />
      </div>
      <TextField label="Reason for the change" value={values.reason} onChange={set('reason')} error={errors.reason ?? server.reason} hint="Kept in the change record with your name and the time." />
      {large && (
        <Notice tone="attention">
          A bound moves by more than ×{approvalFactor}: this change waits for a second person (another metallurgist or a supervisor) before it takes effect.
        </Notice>
      )}
      <div className="flex justify-end gap-3">
        <Button onClick={onDone}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={change.isPending}>
          {change.isPending ? 'Sending…' : large ? 'Ask for approval' : 'Change band'}
        </Button>
      </div>
    </form>
  );
}
