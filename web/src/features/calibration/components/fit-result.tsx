import type { ReactNode } from 'react';
import { SLOPE_EFFICIENCY_OK, type FitResult } from '@shared/schemas/calibration';
import { Notice } from '../../../components/ui/notice';
import { Quantity } from '../../../components/ui/quantity';
import { formatFixed, formatTempC } from '../../../lib/format';
import { FitPointsTable } from './fit-points-table';
import { ResidualChart } from './residual-chart';

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex flex-col">
      <dt className="text-sm text-ink-muted">{label}</dt>
      <dd className="text-lg">{children}</dd>
    </div>
  );
}

/** What the fit found, how well it fits, and how it compares with the calibration in force. */
export function FitResultView({ fit, timeZone }: { fit: FitResult; timeZone: string }) {
  const eff = fit.slopeEfficiency;
  const cur = fit.current;
  return (
    <div className="flex flex-col gap-4" data-testid="fit-result">
      <dl className="grid grid-cols-2 gap-4 sm:grid-cols-4">
        <Fact label="E°′ at 25 °C (vs SHE)"><Quantity value={formatFixed(fit.formalPotentialV, 4)} unit="V" /></Fact>
        <Fact label="Temperature coefficient k"><Quantity value={formatFixed(fit.formalCoeffVPerK * 1000, 2)} unit="mV/K" /></Fact>
        <Fact label="Assays used"><Quantity value={String(fit.n)} /></Fact>
        <Fact label="Residual rms"><Quantity value={formatFixed(fit.rmsMv, 1)} unit="mV" /></Fact>
        <Fact label="Slope efficiency">{eff == null ? <span className="text-base text-ink-muted">needs lab ratios spanning a decade</span> : <Quantity value={formatFixed(eff * 100, 1)} unit="%" />}</Fact>
        <Fact label="Assay temperatures"><Quantity value={`${formatTempC(fit.meanTempC)} ± ${formatFixed(fit.tempSpanC / 2, 1)}`} unit="°C" /></Fact>
      </dl>
      <p className="text-sm text-ink-muted">{fit.tempCoeffNote}</p>
      {fit.slopeWarning ? (
        <Notice tone="attention">
          <span aria-hidden="true">▲ </span>
          {fit.slopeWarning}
        </Notice>
      ) : eff != null ? (
        <p className="text-sm text-ink-muted">Slope within {SLOPE_EFFICIENCY_OK.min * 100}–{SLOPE_EFFICIENCY_OK.max * 100} % of the Nernst slope.</p>
      ) : null}
      {cur && (
        <p className="text-sm">
          Against version {cur.version} in force (E°′ {formatFixed(cur.formalPotentialV, 4)} V, k {formatFixed(cur.formalCoeffVPerK * 1000, 2)} mV/K): residual rms{' '}
          <strong>{formatFixed(cur.rmsMv, 1)} mV</strong> now, <strong>{formatFixed(fit.rmsMv, 1)} mV</strong> with the new fit; the formal potential moves by{' '}
          <strong>{formatFixed(cur.shiftMv, 1)} mV</strong> at {formatTempC(fit.meanTempC)} °C.
        </p>
      )}
      {fit.skipped.length > 0 && (
        <details className="text-sm">
          <summary className="cursor-pointer">{fit.skipped.length} assay(s) in the window could not be used</summary>
          <ul className="mt-1 list-disc pl-6 text-ink-muted">
            {fit.skipped.map((s) => <li key={s.assayId}>{s.sampledAt.replace('T', ' ').slice(0, 16)} UTC: {s.reason}</li>)}
          </ul>
        </details>
      )}
      <ResidualChart points={fit.points} timeZone={timeZone} />
      <FitPointsTable points={fit.points} timeZone={timeZone} />
    </div>
  );
}
