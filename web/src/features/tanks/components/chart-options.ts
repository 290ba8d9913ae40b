import uPlot from 'uplot';
import type { Band } from '@shared/schemas/plant';
import type { AssayPoint } from '../api/get-tank-assays';
import { formatMv, formatRatio, formatTempC } from '../../../lib/format';

export type ChartColours = { line: string; muted: string; grid: string; band: string; uncertainty: string; bucket: string; edge: string; assayFill: string };

/**
 * Canvas cannot read CSS variables itself: resolve them once per theme.
 * @param _theme the theme now applied to the document; only a cache key for the caller's memo
 */
export function readChartColours(_theme: string): ChartColours {
  const css = getComputedStyle(document.documentElement);
  const v = (name: string) => css.getPropertyValue(name).trim();
  return {
    line: v('--fs-chart-line'),
    muted: v('--fs-ink-muted'),
    grid: v('--fs-chart-grid'),
    band: v('--fs-chart-band'),
    uncertainty: v('--fs-chart-uncertainty'),
    bucket: v('--fs-chart-grid'),
    edge: v('--fs-ink-muted'),
    assayFill: v('--fs-panel'),
  };
}

/** Charts of one tank share cursor and zoom. */
export type ChartGroup = { charts: Set<uPlot>; syncing: boolean };

type Common = {
  width: number;
  height: number;
  colours: ChartColours;
  timeZone: string;
  syncKey: string;
  group: ChartGroup;
  onZoom: () => void;
  onReset: () => void;
  onCursor: (idx: number | null) => void;
};

/** 24-hour site time; the date is added under the first tick of each day. */
function timeAxisValues(timeZone: string): uPlot.Axis.DynamicValues {
  const hm = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
  const md = new Intl.DateTimeFormat('en-CA', { timeZone, month: '2-digit', day: '2-digit' });
  return (_u, splits, _axisIdx, _space, incr) => {
    let lastDay = '';
    return splits.map((s) => {
      const ms = s * 1000;
      const day = md.format(ms);
      const newDay = day !== lastDay;
      lastDay = day;
      if (incr >= 86_400) return day;
      return newDay ? `${hm.format(ms)}\n${day}` : hm.format(ms);
    });
  };
}

function common(c: Common, yLabel: string, yValues: (v: number) => string): Omit<uPlot.Options, 'series'> {
  const axis = { stroke: c.colours.muted, grid: { stroke: c.colours.grid, width: 1 }, ticks: { stroke: c.colours.grid, width: 1 }, font: '12px Barlow, system-ui, sans-serif', labelFont: '600 12px Barlow, system-ui, sans-serif' };
  return {
    width: c.width,
    height: c.height,
    tzDate: (ts) => uPlot.tzDate(new Date(ts * 1e3), c.timeZone),
    legend: { show: false },
    cursor: { sync: { key: c.syncKey }, drag: { x: true, y: false, setScale: true }, points: { size: 6 } },
    axes: [
      { ...axis, values: timeAxisValues(c.timeZone) },
      { ...axis, label: yLabel, labelSize: 18, size: 56, values: (_u, splits) => splits.map((v) => (v == null ? '' : yValues(v))) },
    ],
    hooks: {
      init: [
        (u) => {
          c.group.charts.add(u);
          // uPlot resets the zoom on double-click by itself; we only need to know it happened.
          u.over.addEventListener('dblclick', c.onReset);
        },
      ],
      destroy: [(u) => c.group.charts.delete(u)],
      setSelect: [(u) => u.select.width > 0 && c.onZoom()],
      setCursor: [(u) => c.onCursor(u.cursor.idx ?? null)],
      setScale: [
        (u, key) => {
          if (key !== 'x' || c.group.syncing) return;
          const { min, max } = u.scales.x;
          if (min == null || max == null) return;
          c.group.syncing = true;
          for (const other of c.group.charts) if (other !== u) other.setScale('x', { min, max });
          c.group.syncing = false;
        },
      ],
    },
  };
}

/** Shades the band and draws its limits under the series. */
function bandPlugin(band: Band, colours: ChartColours): uPlot.Plugin {
  return {
    hooks: {
      drawClear: (u) => {
        const { ctx, bbox } = u;
        const yHigh = u.valToPos(band.high, 'y', true);
        const yLow = u.valToPos(band.low, 'y', true);
        ctx.save();
        ctx.beginPath();
        ctx.rect(bbox.left, bbox.top, bbox.width, bbox.height);
        ctx.clip();
        ctx.fillStyle = colours.band;
        ctx.fillRect(bbox.left, Math.min(yHigh, yLow), bbox.width, Math.abs(yLow - yHigh));
        ctx.strokeStyle = colours.edge;
        ctx.lineWidth = 1 * uPlot.pxRatio;
        ctx.setLineDash([6 * uPlot.pxRatio, 4 * uPlot.pxRatio]);
        for (const y of [yHigh, yLow]) {
          ctx.beginPath();
          ctx.moveTo(bbox.left, y);
          ctx.lineTo(bbox.left + bbox.width, y);
          ctx.stroke();
        }
        ctx.restore();
      },
    },
  };
}

/** Lab assays as hollow diamonds at their sampling time and lab ratio (a shape, so not read as an alarm colour). */
function assayPlugin(assays: AssayPoint[], colours: ChartColours): uPlot.Plugin {
  return {
    hooks: {
      draw: (u) => {
        const { ctx, bbox } = u;
        const r = 5 * uPlot.pxRatio;
        ctx.save();
        ctx.lineWidth = 1.75 * uPlot.pxRatio;
        ctx.strokeStyle = colours.line;
        ctx.fillStyle = colours.assayFill;
        for (const a of assays) {
          const x = u.valToPos(a.t, 'x', true);
          const y = u.valToPos(a.labRatio, 'y', true);
          if (x < bbox.left || x > bbox.left + bbox.width || y < bbox.top || y > bbox.top + bbox.height) continue;
          ctx.beginPath();
          ctx.moveTo(x, y - r);
          ctx.lineTo(x + r, y);
          ctx.lineTo(x, y + r);
          ctx.lineTo(x - r, y);
          ctx.closePath();
          ctx.fill();
          ctx.stroke();
        }
        ctx.restore();
      },
    },
  };
}

/** Ratio on a log axis, band shaded, uncertainty (ratio ×/÷ factor) and bucket range as fills, lab assays as diamonds. */
export function ratioChartOptions(c: Common, band: Band, assays: AssayPoint[] = []): uPlot.Options {
  const base = common(c, 'Fe³⁺/Fe²⁺ (log)', formatRatio);
  const hidden = { stroke: 'transparent', points: { show: false } };
  return {
    ...base,
    plugins: [bandPlugin(band, c.colours), assayPlugin(assays, c.colours)],
    scales: {
      y: {
        distr: 3,
        log: 10,
        // Always include the band, so the shading is on screen whatever the values do.
        range: (_u, min, max) => {
          const lo = Math.min(min ?? band.low, band.low);
          const hi = Math.max(max ?? band.high, band.high);
          return [lo / 1.5, hi * 1.5];
        },
      },
    },
    series: [
      {},
      { label: 'Ratio', stroke: c.colours.line, width: 1.75, points: { show: false } },
      { label: 'Ratio × uncertainty', ...hidden },
      { label: 'Ratio ÷ uncertainty', ...hidden },
      { label: 'Bucket max', ...hidden },
      { label: 'Bucket min', ...hidden },
    ],
    bands: [
      { series: [2, 3], fill: c.colours.uncertainty },
      { series: [4, 5], fill: c.colours.bucket },
    ],
  };
}

export function orpChartOptions(c: Common): uPlot.Options {
  return {
    ...common(c, 'ORP mV', formatMv),
    scales: { y: { auto: true } },
    series: [{}, { label: 'ORP', stroke: c.colours.line, width: 1.5, points: { show: false } }],
  };
}

export function tempChartOptions(c: Common): uPlot.Options {
  return {
    ...common(c, 'Temp °C', formatTempC),
    scales: { y: { auto: true } },
    series: [{}, { label: 'Temperature', stroke: c.colours.line, width: 1.5, points: { show: false } }],
  };
}

export type { Common as ChartCommon };
