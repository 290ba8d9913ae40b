import { useState, type FormEvent } from 'react';
import { probeCheck } from '@shared/redox';
import type { CalibrationOverview } from '@shared/schemas/calibration';
import { STANDARDS, STANDARD_LABELS, probeCheckSchema } from '@shared/schemas/probe-checks';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextField } from '../../../components/ui/field';
import { formatFixed, formatMv } from '../../../lib/format';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import { useRecordProbeCheck } from '../api/record-probe-check';

type Probe = NonNullable<CalibrationOverview['probe']>;
const num = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.replace(',', '.')));

/** A check against ZoBell's or Light's solution; expected value, error and verdict shown before it is stored. */
export function ProbeCheckForm({ probe, toleranceMv, timeZone }: { probe: Probe; toleranceMv: number; timeZone: string }) {
  const [v, setV] = useState(() => ({ standard: 'zobell', tempC: '25', readingMv: '', toleranceMv: String(toleranceMv), checkedAt: isoToSiteLocal(Date.now(), timeZone), note: '' }));
  const [errors, setErrors] = useState<FieldErrors>({});
  const record = useRecordProbeCheck();
  const server = serverFieldErrors(record.error);
  const set = (k: keyof typeof v) => (e: { target: { value: string } }) => setV((x) => ({ ...x, [k]: e.target.value }));
  const input = {
    probeId: probe.id, standard: v.standard, tempC: num(v.tempC), readingMv: num(v.readingMv), toleranceMv: num(v.toleranceMv),
    checkedAt: siteLocalToIso(v.checkedAt, timeZone) ?? undefined, note: v.note || undefined,
  };
  let preview: ReturnType<typeof probeCheck> | string | null = null;
  if (Number.isFinite(input.readingMv)) {
    try {
      const reference = { id: 'probe', label: probe.referenceLabel, e25V: probe.referenceE25V, coeffVPerK: probe.referenceCoeffVPerK, source: probe.tag };
      preview = probeCheck({ standard: v.standard as 'zobell' | 'light', tempC: input.tempC, reference, readingMv: input.readingMv, toleranceMv: input.toleranceMv });
    } catch (err) {
      preview = (err as Error).message;
    }
  }
  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = probeCheckSchema.safeParse(input);
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    record.mutate(parsed.data, { onSuccess: () => setV((x) => ({ ...x, readingMv: '', note: '' })) });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={`Record a check of ${probe.tag}`} className="flex flex-col gap-3">
      <FormError>{formMessage(record.error)}</FormError>
      <div className="grid gap-3 sm:grid-cols-3">
        <SelectField label="Standard solution" value={v.standard} onChange={set('standard')} options={STANDARDS.map((s) => ({ value: s, label: STANDARD_LABELS[s] }))} />
        <TextField label="Temperature of the standard" inputMode="decimal" unit="°C" value={v.tempC} onChange={set('tempC')} error={errors.tempC ?? server.tempC} />
        <TextField label="Reading" inputMode="decimal" unit="mV" value={v.readingMv} onChange={set('readingMv')} error={errors.readingMv ?? server.readingMv} />
        <TextField label="Tolerance" inputMode="decimal" unit="± mV" value={v.toleranceMv} onChange={set('toleranceMv')} error={errors.toleranceMv} />
        <TextField label="Checked at (site time)" type="datetime-local" value={v.checkedAt} onChange={set('checkedAt')} error={errors.checkedAt} />
        <TextField label="Note" value={v.note} onChange={set('note')} />
      </div>
      {typeof preview === 'string' ? (
        <p className="text-sm font-medium text-attention-1-ink">✕ {preview}</p>
      ) : preview ? (
        <p className="text-sm tabular-nums" role="status">
          Expected {formatMv(preview.expectedMv)} mV vs {probe.referenceLabel} · error {formatFixed(preview.errorMv, 1)} mV ·{' '}
          <strong>{preview.pass ? 'Pass' : '✕ Fail: clean, refill or replace before trusting this probe'}</strong>
        </p>
      ) : null}
      {v.standard === 'light' ? (
        <p className="text-xs text-ink-muted" data-testid="light-caution">
          Light's solution is made up in about 1 M sulfuric acid: wear eye and skin protection, neutralise spills, and never mix it with ZoBell's
          solution or other cyanide-bearing waste (acid releases hydrogen cyanide). Follow the safety data sheet and site procedures.
        </p>
      ) : (
        <p className="text-xs text-ink-muted">ZoBell's solution contains cyanide complexes: never acidify it. Follow the safety data sheet.</p>
      )}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={record.isPending}>{record.isPending ? 'Recording…' : 'Record check'}</Button>
      </div>
    </form>
  );
}
