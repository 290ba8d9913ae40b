import { useState, type FormEvent } from 'react';
import { bandCopySchema, type BandRow } from '@shared/schemas/bands';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { formatRatio } from '../../../lib/format';
import { formMessage, issuesToFieldErrors, serverFieldErrors, type FieldErrors } from '../../../lib/form';
import { useCopyBand } from '../api/copy-band';

type Props = { from: BandRow; circuitTanks: BandRow[]; onDone: () => void; onChanged?: () => void };

/** Copy one tank's band to others of its circuit in one step; each tank gets its own record. */
export function BandCopyForm({ from, circuitTanks, onDone, onChanged }: Props) {
  const others = circuitTanks.filter((t) => t.tankId !== from.tankId);
  const [chosen, setChosen] = useState<number[]>(others.map((t) => t.tankId));
  const [reason, setReason] = useState('');
  const [errors, setErrors] = useState<FieldErrors>({});
  const copy = useCopyBand(onChanged);
  const server = serverFieldErrors(copy.error);
  const toggle = (id: number) => setChosen((c) => (c.includes(id) ? c.filter((x) => x !== id) : [...c, id]));

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const parsed = bandCopySchema.safeParse({ tankIds: chosen, reason });
    if (!parsed.success) return setErrors(issuesToFieldErrors(parsed.error.issues));
    setErrors({});
    copy.mutate({ fromTankId: from.tankId, input: parsed.data }, { onSuccess: onDone });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={`Copy band of ${from.tankTag}`} className="flex flex-col gap-4">
      <h3 className="font-bold">
        Copy {formatRatio(from.band.low)}–{formatRatio(from.band.high)}
        {from.band.target != null && ` (target ${formatRatio(from.band.target)})`} from {from.tankTag} to
      </h3>
      <FormError>{formMessage(copy.error)}</FormError>
      <fieldset className="flex flex-wrap gap-x-5 gap-y-2">
        <legend className="sr-only">Tanks of circuit {from.circuitTag}</legend>
        {others.map((t) => (
          <label key={t.tankId} className="inline-flex items-center gap-2">
            <input type="checkbox" checked={chosen.includes(t.tankId)} onChange={() => toggle(t.tankId)} className="h-4 w-4" />
            <span className="font-semibold">{t.tankTag}</span>
            <span className="text-sm text-ink-muted tabular-nums">
              now {formatRatio(t.band.low)}–{formatRatio(t.band.high)}
            </span>
          </label>
        ))}
      </fieldset>
      {(errors.tankIds ?? server.tankIds) && <p className="text-sm font-medium text-attention-1-ink">✕ {errors.tankIds ?? server.tankIds}</p>}
      <TextField label="Reason for the change" value={reason} onChange={(e) => setReason(e.target.value)} error={errors.reason ?? server.reason} />
      <p className="text-sm text-ink-muted">Tanks whose band would move by more than the site's approval factor wait for a second person.</p>
      <div className="flex justify-end gap-3">
        <Button onClick={onDone}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={copy.isPending || chosen.length === 0}>
          {copy.isPending ? 'Copying…' : `Copy to ${chosen.length} tank${chosen.length === 1 ? '' : 's'}`}
        </Button>
      </div>
    </form>
  );
}
