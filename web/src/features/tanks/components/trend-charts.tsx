import { useMemo, useRef, useState } from 'react';
import UplotReact from 'uplot-react';
import type uPlot from 'uplot';
import 'uplot/dist/uPlot.min.css';
import type { Band, ProbeInfo, TrendResponse } from '@shared/schemas/plant';
import { uncertaintyFactor } from '../../../lib/redox-view';
import { useTheme } from '../../../lib/theme';
import type { AssayPoint } from '../api/get-tank-assays';
import { useElementSize } from '../hooks/use-element-size';
import { orpChartOptions, ratioChartOptions, readChartColours, tempChartOptions, type ChartColours, type ChartGroup } from './chart-options';
import { ChartLegend, type LegendMark } from '../../../components/ui/chart-legend';
import { TrendReadout } from './trend-readout';
import { expectedStepS, withGaps } from '../utils/trend-gaps';

type Props = { tankId: number; trend: TrendResponse; band: Band; probe: ProbeInfo | null; timeZone: string; assays?: AssayPoint[] };

const NO_ASSAYS: AssayPoint[] = [];

const GAP = 8;

/** The ratio chart's marks, in the colours the canvas uses. */
function legendItems(c: ChartColours, buckets: boolean, assays: number, toleranceMv: number | undefined): Array<{ label: string; mark: LegendMark }> {
  return [
    { label: 'Ratio', mark: { kind: 'line', colour: c.line } },
    { label: 'Band (between dashed lines)', mark: { kind: 'fill', colour: c.band, edge: c.edge } },
    { label: toleranceMv ? `Probe tolerance (±${toleranceMv} mV)` : 'Probe tolerance', mark: { kind: 'fill', colour: c.uncertainty } },
    ...(buckets ? [{ label: 'Bucket range', mark: { kind: 'fill', colour: c.bucket } as LegendMark }] : []),
    ...(assays > 0 ? [{ label: `Lab assay (${assays})`, mark: { kind: 'diamond', colour: c.line, fill: c.assayFill } as LegendMark }] : []),
  ];
}

/** Ratio, ORP and temperature over the same time axis; drag to zoom, double-click to reset. */
export function TrendCharts({ tankId, trend, band, probe, timeZone, assays = NO_ASSAYS }: Props) {
  const boxRef = useRef<HTMLDivElement>(null);
  const { width, height } = useElementSize(boxRef);
  const theme = useTheme();
  const [zoomed, setZoomed] = useState(false);
  const [cursorIdx, setCursorIdx] = useState<number | null>(null);
  const [group] = useState<ChartGroup>(() => ({ charts: new Set<uPlot>(), syncing: false }));

  // Colours come from CSS variables of the current theme: re-read when it changes.
  const colours = useMemo(() => readChartColours(theme), [theme]);
  const common = useMemo(
    () => ({
      width: 0,
      height: 0,
      colours,
      timeZone,
      syncKey: `tank-${tankId}`,
      group,
      onZoom: () => setZoomed(true),
      onReset: () => setZoomed(false),
      onCursor: setCursorIdx,
    }),
    [colours, timeZone, tankId, group],
  );
  const ratioOpts = useMemo(() => ratioChartOptions(common, band, assays), [common, band, assays]);
  const orpOpts = useMemo(() => orpChartOptions(common), [common]);
  const tempOpts = useMemo(() => tempChartOptions(common), [common]);

  const { shown, data, factors } = useMemo(() => {
    const g = withGaps(trend, expectedStepS(trend.resolution, probe?.intervalS));
    const f = g.tempC.map((tempC) => uncertaintyFactor(probe, tempC));
    const hi = g.ratio.map((r, i) => (r != null && f[i] ? r * f[i]! : null));
    const lo = g.ratio.map((r, i) => (r != null && f[i] ? r / f[i]! : null));
    return {
      shown: g,
      factors: f,
      data: {
        ratio: [g.t, g.ratio, hi, lo, g.ratioMax, g.ratioMin] as uPlot.AlignedData,
        orp: [g.t, g.orpMv] as uPlot.AlignedData,
        temp: [g.t, g.tempC] as uPlot.AlignedData,
      },
    };
  }, [trend, probe]);

  const usable = Math.max(0, height - 2 * GAP);
  const h1 = Math.max(160, Math.round(usable * 0.46));
  const h2 = Math.max(110, Math.round((usable - h1) / 2));
  const empty = trend.t.length === 0;

  return (
    <div className="flex min-h-0 flex-1 flex-col gap-2">
      <TrendReadout trend={shown} factors={factors} idx={cursorIdx} timeZone={timeZone} zoomed={zoomed} />
      <ChartLegend label="Ratio chart legend" items={legendItems(colours, trend.resolution !== 'raw', assays.length, probe?.toleranceMv)} />
      <div ref={boxRef} className="relative min-h-[26rem] flex-1" data-testid="trend-charts">
        {empty && (
          <div className="absolute inset-0 z-10 flex items-center justify-center text-ink-muted">No readings in this range.</div>
        )}
        {width > 0 && (
          <div className="flex flex-col" style={{ gap: GAP }}>
            <UplotReact options={{ ...ratioOpts, width, height: h1 }} data={data.ratio} resetScales={!zoomed} />
            <UplotReact options={{ ...orpOpts, width, height: h2 }} data={data.orp} resetScales={!zoomed} />
            <UplotReact options={{ ...tempOpts, width, height: h2 }} data={data.temp} resetScales={!zoomed} />
          </div>
        )}
      </div>
    </div>
  );
}
