import { useMemo, useRef } from 'react';
import UplotReact from 'uplot-react';
import type uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { FitResult } from '@shared/schemas/calibration';
import { useTheme } from '../../../lib/theme';
import { AXIS_FONT, LABEL_FONT, readColours, useWidth } from './chart-kit';

type Xy = { x: number; y: number; suspect: boolean };
type Props = { title: string; xLabel: string; yLabel: string; points: Xy[]; line: (x: number) => number; lineLabel: string };

/** Assays as dots (suspects as amber diamonds-by-size and a legend entry), the fitted line through them. */
function ScatterWithLine({ title, xLabel, yLabel, points, line, lineLabel }: Props) {
  const box = useRef<HTMLDivElement>(null);
  const width = useWidth(box);
  const theme = useTheme();
  const colours = useMemo(() => readColours(theme), [theme]);
  const data = useMemo<uPlot.AlignedData>(() => {
    // uPlot wants x ascending; a straight line drawn through sorted x is still the fitted line.
    const s = [...points].sort((a, b) => a.x - b.x);
    return [s.map((p) => p.x), s.map((p) => (p.suspect ? null : p.y)), s.map((p) => (p.suspect ? p.y : null)), s.map((p) => line(p.x))];
  }, [points, line]);
  const options = useMemo<uPlot.Options>(() => {
    const { ink, muted, attention } = colours;
    const grid = { stroke: colours.grid, width: 1 };
    return {
      width, height: 240, legend: { show: true }, cursor: { drag: { x: false, y: false } },
      scales: { x: { time: false } },
      axes: [
        { stroke: muted, grid, font: AXIS_FONT, label: xLabel, labelFont: LABEL_FONT },
        { stroke: muted, grid, font: AXIS_FONT, label: yLabel, labelFont: LABEL_FONT, size: 56 },
      ],
      series: [
        {},
        { label: 'Assay', stroke: ink, paths: () => null, points: { show: true, size: 8, width: 1.5, stroke: ink, fill: ink } },
        { label: 'Suspect assay', stroke: attention, paths: () => null, points: { show: true, size: 12, width: 2.5, stroke: attention, fill: 'transparent' } },
        { label: lineLabel, stroke: muted, width: 1.5, points: { show: false } },
      ],
    };
  }, [width, colours, xLabel, yLabel, lineLabel]);
  return (
    <figure className="flex flex-col gap-1">
      <figcaption className="text-sm font-semibold">{title}</figcaption>
      <div ref={box} className="w-full" role="img" aria-label={`${title}: ${points.length} assays; the table below lists them`}>
        {width > 0 && <UplotReact options={options} data={data} />}
      </div>
    </figure>
  );
}

/**
 * The two views a metallurgist checks a fit by: the potential against the Nernst term (the slope
 * should be the full R·T/F; curvature or a flat slope means a sluggish probe or a mixed potential),
 * and each assay's own E°′ against temperature with the coefficient used.
 */
export function FitPlots({ fit }: { fit: FitResult }) {
  const slope = fit.usedSlopeEfficiency;
  const e0Mean = fit.atMeanTemp.formalPotentialV * 1000;
  const nernst = useMemo(() => fit.points.map((p) => ({ x: p.nernstTermV * 1000, y: p.eSheV * 1000, suspect: p.suspect })), [fit.points]);
  const byTemp = useMemo(() => fit.points.map((p) => ({ x: p.tempC, y: p.pointFormalPotentialV * 1000, suspect: p.suspect })), [fit.points]);
  const nernstLine = useMemo(() => (x: number) => e0Mean + slope * x, [e0Mean, slope]);
  const tempLine = useMemo(() => (t: number) => (fit.formalPotentialV + fit.formalCoeffVPerK * (t - 25)) * 1000, [fit.formalPotentialV, fit.formalCoeffVPerK]);
  return (
    <div className="grid gap-4 lg:grid-cols-2">
      <ScatterWithLine
        title="Potential against the Nernst term"
        xLabel="(R·T/F)·ln(lab ratio), mV" yLabel="E vs SHE, mV"
        points={nernst} line={nernstLine}
        lineLabel={`Fit at ${fit.atMeanTemp.tempC.toFixed(1)} °C, slope ${(slope * 100).toFixed(0)} %`}
      />
      <ScatterWithLine
        title="E°′ of each assay against temperature"
        xLabel="Temperature, °C" yLabel="E°′ vs SHE, mV"
        points={byTemp} line={tempLine}
        lineLabel={`k = ${(fit.formalCoeffVPerK * 1000).toFixed(2)} mV/K (${fit.fittedTempCoeff ? 'fitted' : 'kept'})`}
      />
    </div>
  );
}
