import type { ReactNode } from 'react';
import { SLOPE_EFFICIENCY_OK, type FitResult } from '@shared/schemas/calibration';
import { Notice } from '../../../components/ui/notice';
import { Quantity } from '../../../components/ui/quantity';
import { formatFixed, formatTempC } from '../../../lib/format';
import { FitPlots } from './fit-plots';
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

const pm = (v: number, se: number | null, digits: number) => (se == null || !Number.isFinite(se) ? formatFixed(v, digits) : `${formatFixed(v, digits)} ± ${formatFixed(se, digits)}`);

type Props = { fit: FitResult; timeZone: string; onUseSlope?: (slope: number) => void; onExclude?: (assayId: number) => void };

/** What the fit found, how well it fits, and how it compares with the calibration in force. */
export function FitResultView({ fit, timeZone, onUseSlope, onExclude }: Props) {
  const eff = fit.slopeEfficiency;
  const cur = fit.current;
  const se = fit.standardErrors;
  const suspects = fit.points.filter((p) => p.suspect).length;
  return (
    <div className="flex flex-col gap-4" data-testid="fit-result">
      <dl className="grid grid-cols-2 gap-4 sm:grid-cols-4">
        <Fact label={`E°′ at ${formatTempC(fit.atMeanTemp.tempC)} °C, the assays' mean (vs SHE)`}>
          <Quantity value={pm(fit.atMeanTemp.formalPotentialV * 1000, fit.atMeanTemp.standardErrorV * 1000, 1)} unit="mV" />
        </Fact>
        <Fact label="E°′ at 25 °C (vs SHE)"><Quantity value={pm(fit.formalPotentialV * 1000, se.formalPotentialV * 1000, 1)} unit="mV" /></Fact>
        <Fact label={fit.fittedTempCoeff ? 'Temperature coefficient k (fitted)' : 'Temperature coefficient k (kept)'}>
          <Quantity value={pm(fit.formalCoeffVPerK * 1000, se.formalCoeffVPerK == null ? null : se.formalCoeffVPerK * 1000, 2)} unit="mV/K" />
        </Fact>
        <Fact label="Assays used"><Quantity value={String(fit.n)} /></Fact>
        <Fact label="Residual standard error"><Quantity value={Number.isFinite(fit.rmsMv) ? formatFixed(fit.rmsMv, 1) : '—'} unit="mV" /></Fact>
        <Fact label="Slope efficiency (free fit)">
          {eff == null ? <span className="text-base text-ink-muted">needs lab ratios spanning a decade</span>
            : <Quantity value={pm(eff * 100, fit.slopeFit ? fit.slopeFit.standardError * 100 : null, 1)} unit="%" />}
        </Fact>
        <Fact label="Slope used for E°′"><Quantity value={formatFixed(fit.usedSlopeEfficiency * 100, 1)} unit="%" /></Fact>
        <Fact label="Assay temperatures"><Quantity value={`${formatTempC(fit.meanTempC)} ± ${formatFixed(fit.tempSpanC / 2, 1)}`} unit="°C" /></Fact>
      </dl>
      <p className="text-sm" data-testid="k-note">{fit.tempCoeffNote}</p>
      <p className="text-sm text-ink-muted">
        ± figures are one standard error from ordinary least squares. E°′ at the assays' mean temperature is what this tank's readings depend on;
        the 25 °C value carries the uncertainty of k as well.
      </p>
      {suspects > 0 && (
        <Notice tone="attention">
          <span aria-hidden="true">◆ </span>
          {suspects} assay(s) stand out from the others by more than 3 standard errors (externally studentized residual): check the titration and
          the sampling time, and leave them out with a reason if they are wrong.
        </Notice>
      )}
      {eff != null && onUseSlope && Math.abs(eff - fit.usedSlopeEfficiency) > 0.005 && (
        <div>
          <button type="button" className="text-sm text-info-ink underline" onClick={() => onUseSlope(Math.round(eff * 1000) / 1000)}>
            Fit E°′ with the probe's own slope ({formatFixed(eff * 100, 1)} %) and store it with the calibration
          </button>
        </div>
      )}
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
      <FitPlots fit={fit} />
      <ResidualChart points={fit.points} timeZone={timeZone} />
      <FitPointsTable points={fit.points} timeZone={timeZone} onExclude={onExclude} />
    </div>
  );
}
