import { useState } from 'react';
import { calibrationFitSchema, type ApplyResult, type CalibrationFitInput } from '@shared/schemas/calibration';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { Loading } from '../../../components/ui/page-state';
import { formMessage, issuesToFieldErrors, type FieldErrors } from '../../../lib/form';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import { useFitCalibration } from '../api/fit-calibration';
import { useTankAssays } from '../api/get-tank-assays';
import { ApplyForm } from './apply-form';
import { AssayChoice, type Exclusions } from './assay-choice';
import { FitResultView } from './fit-result';
import { RecomputeForm } from './recompute-form';

const DAY = 86_400_000;
type Props = { tankId: number; timeZone: string; canApply: boolean; onCalibrationChanged?: () => void };

/** Choose the assays (window, exclusions), fit, look at the residuals, then apply with a reason. */
export function FitPanel({ tankId, timeZone, canApply, onCalibrationChanged }: Props) {
  const [range, setRange] = useState(() => ({ from: isoToSiteLocal(Date.now() - 90 * DAY, timeZone), to: isoToSiteLocal(Date.now() + 60_000, timeZone) }));
  const [excluded, setExcluded] = useState<Exclusions>({});
  const [errors, setErrors] = useState<FieldErrors>({});
  const [applied, setApplied] = useState<ApplyResult | null>(null);
  const [slope, setSlope] = useState(1);
  const fromIso = siteLocalToIso(range.from, timeZone) ?? '';
  const toIso = siteLocalToIso(range.to, timeZone) ?? '';
  const assays = useTankAssays(tankId, fromIso, toIso);
  const fit = useFitCalibration();
  const input: CalibrationFitInput = {
    from: fromIso, to: toIso, excluded: Object.entries(excluded).map(([id, reason]) => ({ assayId: Number(id), reason })), slopeEfficiency: slope,
  };

  const runFit = (withSlope = slope) => {
    const parsed = calibrationFitSchema.safeParse({ ...input, slopeEfficiency: withSlope });
    if (!parsed.success) {
      const e = issuesToFieldErrors(parsed.error.issues);
      return setErrors(e.excluded ? { ...e, excluded: 'Give a reason (at least 3 characters) for every assay left out' } : e);
    }
    setErrors({});
    setApplied(null);
    fit.mutate({ tankId, input: parsed.data });
  };
  const setR = (k: 'from' | 'to') => (e: { target: { value: string } }) => {
    setRange((r) => ({ ...r, [k]: e.target.value }));
    fit.reset();
  };

  return (
    <div className="flex flex-col gap-4">
      <div className="grid gap-3 sm:grid-cols-2">
        <TextField label="Assays from (site time)" type="datetime-local" value={range.from} onChange={setR('from')} error={errors.from} />
        <TextField label="Assays to (site time)" type="datetime-local" value={range.to} onChange={setR('to')} error={errors.to} />
      </div>
      {assays.isPending ? (
        <Loading label="Loading assays…" />
      ) : assays.isError ? (
        <FormError>{assays.error.message}</FormError>
      ) : assays.data.assays.length === 0 ? (
        <p className="text-ink-muted">No assays for this tank in the window.</p>
      ) : (
        <AssayChoice assays={assays.data.assays} excluded={excluded} onChange={(x) => { setExcluded(x); fit.reset(); }} timeZone={timeZone} windowMin={assays.data.windowMin} />
      )}
      {errors.excluded && <p className="text-sm font-medium text-attention-1-ink">✕ {errors.excluded}</p>}
      <FormError>{formMessage(fit.error)}</FormError>
      <div className="flex justify-end gap-2">
        {slope !== 1 && (
          <Button onClick={() => { setSlope(1); runFit(1); }} disabled={fit.isPending}>Back to the full Nernst slope</Button>
        )}
        <Button variant="primary" onClick={() => runFit()} disabled={fit.isPending || !assays.data?.assays.length}>
          {fit.isPending ? 'Fitting…' : 'Fit E°′'}
        </Button>
      </div>
      {fit.data && (
        <>
          <FitResultView
            fit={fit.data} timeZone={timeZone}
            onUseSlope={(s) => { setSlope(s); runFit(s); }}
            // The reason box opens in the assay list above; the next fit leaves the assay out.
            onExclude={(id) => { setExcluded((x) => ({ ...x, [id]: x[id] ?? '' })); fit.reset(); }}
          />
          {canApply && !applied && (
            <ApplyForm tankId={tankId} window={input} fit={fit.data} onApplied={setApplied} onCalibrationChanged={onCalibrationChanged} />
          )}
        </>
      )}
      {applied && (
        <>
          <Notice>
            Version {applied.calibration.version} applied. New readings are converted with it from now on; stored readings keep their version.
          </Notice>
          <RecomputeForm tankId={tankId} version={applied.calibration.version} from={fromIso} to={toIso} timeZone={timeZone} />
        </>
      )}
    </div>
  );
}
