import { useMemo, useRef } from 'react';
import UplotReact from 'uplot-react';
import type uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { FitPoint } from '@shared/schemas/calibration';
import { ChartLegend } from '../../../components/ui/chart-legend';
import { useTheme } from '../../../lib/theme';
import { readColours, useWidth } from './chart-kit';

/**
 * Residuals in mV against sampling time: filled dots for the new fit, open rings for the
 * calibration in force. A pattern over time (rather than scatter about zero) points to drift.
 */
export function ResidualChart({ points, timeZone }: { points: FitPoint[]; timeZone: string }) {
  const box = useRef<HTMLDivElement>(null);
  const width = useWidth(box);
  const theme = useTheme();
  const sorted = useMemo(() => [...points].sort((a, b) => Date.parse(a.sampledAt) - Date.parse(b.sampledAt)), [points]);
  const data = useMemo<uPlot.AlignedData>(() => [
    sorted.map((p) => Date.parse(p.sampledAt) / 1000),
    sorted.map((p) => p.residualMv),
    sorted.map((p) => p.currentResidualMv),
    sorted.map(() => 0),
  ], [sorted]);
  const colours = useMemo(() => readColours(theme), [theme]);
  const options = useMemo<uPlot.Options>(() => {
    const { ink, muted } = colours;
    const grid = { stroke: colours.grid, width: 1 };
    const dateFmt = new Intl.DateTimeFormat('en-GB', { timeZone, day: '2-digit', month: 'short' });
    const timeFmt = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    // Ticks less than a day apart need the hour; a campaign over weeks needs only the date.
    const tick: uPlot.Axis.DynamicValues = (_u, splits, _i, _space, incr) =>
      splits.map((s) => (incr < 86_400 ? `${timeFmt.format(s * 1000)}\n${dateFmt.format(s * 1000)}` : dateFmt.format(s * 1000)));
    const dots = (fill: boolean, stroke: string) => ({ show: true, size: 8, width: 1.5, stroke, fill: fill ? stroke : 'transparent' });
    return {
      width, height: 240, legend: { show: false }, cursor: { drag: { x: false, y: false } },
      scales: { x: { time: true } },
      axes: [
        { stroke: muted, grid, font: '12px Barlow, system-ui', values: tick, size: 44 },
        { stroke: muted, grid, font: '12px Barlow, system-ui', label: 'Residual, mV', labelFont: '600 12px Barlow, system-ui', values: (_u, s) => s.map((x) => `${x}`) },
      ],
      series: [
        {},
        { label: 'New fit', stroke: ink, paths: () => null, points: dots(true, ink) },
        { label: 'In force', stroke: muted, paths: () => null, points: dots(false, muted) },
        { label: '0 mV', stroke: muted, width: 1, dash: [4, 4], points: { show: false } },
      ],
    };
  }, [width, timeZone, colours]);

  return (
    <div className="flex w-full flex-col gap-1">
      <div ref={box} className="w-full" role="img" aria-label={`Residuals of ${points.length} assays in mV; the table below lists them`}>
        {width > 0 && <UplotReact options={options} data={data} />}
      </div>
      <ChartLegend
        label="Residual chart legend"
        items={[
          { label: 'New fit', mark: { kind: 'dot', filled: true, colour: colours.ink } },
          { label: 'Calibration in force', mark: { kind: 'dot', filled: false, colour: colours.muted } },
          { label: '0 mV', mark: { kind: 'line', colour: colours.muted, dashed: true } },
        ]}
      />
    </div>
  );
}
