import { useState } from 'react';
import type { ApplyResult, CalibrationFitInput, FitResult } from '@shared/schemas/calibration';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { Notice } from '../../../components/ui/notice';
import { formatFixed } from '../../../lib/format';
import { formMessage, serverFieldErrors } from '../../../lib/form';
import { useApplyCalibration } from '../api/apply-calibration';

type Props = { tankId: number; window: CalibrationFitInput; fit: FitResult; onApplied: (r: ApplyResult) => void; onCalibrationChanged?: () => void };

/** Applying needs a reason; the server refits and refuses if the assays changed since this fit. */
export function ApplyForm({ tankId, window, fit, onApplied, onCalibrationChanged }: Props) {
  const [reason, setReason] = useState('');
  const apply = useApplyCalibration(onCalibrationChanged);
  const server = serverFieldErrors(apply.error);
  const next = (fit.current?.version ?? 0) + 1;
  return (
    <form
      aria-label="Apply calibration"
      className="flex flex-col gap-3"
      onSubmit={(e) => {
        e.preventDefault();
        apply.mutate({ tankId, input: { ...window, reason, expectedFormalPotentialV: fit.formalPotentialV } }, { onSuccess: onApplied });
      }}
    >
      <FormError>{formMessage(apply.error)}</FormError>
      <TextField
        label="Reason for the new calibration"
        value={reason}
        onChange={(e) => setReason(e.target.value)}
        error={server.reason}
        hint={`Becomes version ${next}: E°′ ${formatFixed(fit.formalPotentialV, 4)} V, k ${formatFixed(fit.formalCoeffVPerK * 1000, 2)} mV/K. Readings already stored keep the version they were converted with.`}
      />
      {fit.slopeWarning && <Notice tone="attention">{fit.slopeWarning}</Notice>}
      <div className="flex justify-end">
        <Button type="submit" variant="primary" disabled={reason.trim().length < 3 || apply.isPending}>
          {apply.isPending ? 'Applying…' : `Apply as version ${next}`}
        </Button>
      </div>
    </form>
  );
}
