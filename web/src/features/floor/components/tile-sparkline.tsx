import type { Band } from '@shared/schemas/plant';
import { RECENT_MS, useRecentTrend } from '../api/get-recent-trend';

const W = 200;
const H = 60;
/** A gap longer than this many minutes breaks the line: a silent probe is not drawn across. */
const GAP_S = 180;

/**
 * The last hour of the ratio on a logarithmic scale, the band shaded behind it, so where the
 * tank has been inside its band shows at a glance. Neutral grey: the tile's frame and words carry any abnormal state.
 */
export function TileSparkline({ tankId, band, latest, nowMs, muted }: {
  tankId: number; band: Band; latest: { ts: string; ratio: number } | null; nowMs: number; muted: boolean;
}) {
  const trend = useRecentTrend(tankId);
  const fromS = (nowMs - RECENT_MS) / 1000;
  const pts: Array<[number, number]> = [];
  const data = trend.data;
  if (data) data.t.forEach((t, i) => t >= fromS && data.ratio[i] > 0 && pts.push([t, Math.log10(data.ratio[i])]));
  const latestS = latest ? Date.parse(latest.ts) / 1000 : NaN;
  if (latest && latest.ratio > 0 && latestS > (pts.at(-1)?.[0] ?? -Infinity)) pts.push([latestS, Math.log10(latest.ratio)]);
  if (pts.length < 2) return null;

  const lo = Math.log10(band.low);
  const hi = Math.log10(band.high);
  // A little room around the band, so a tank leaving it shows at once; wider when the values go further.
  const pad = Math.max(0.08, (hi - lo) * 0.15);
  const d0 = Math.min(lo - pad, ...pts.map((p) => p[1] - 0.05));
  const d1 = Math.max(hi + pad, ...pts.map((p) => p[1] + 0.05));
  const x = (s: number) => ((s - fromS) / (RECENT_MS / 1000)) * W;
  const y = (lr: number) => H - ((lr - d0) / (d1 - d0)) * H;
  let path = '';
  pts.forEach(([t, lr], i) => {
    const pen = i > 0 && t - pts[i - 1][0] <= GAP_S;
    path += `${pen ? 'L' : 'M'}${x(t).toFixed(1)} ${y(lr).toFixed(1)} `;
  });

  return (
    <div className="flex h-full min-h-6 flex-col gap-0.5" data-testid="tile-sparkline">
      <span className="text-[length:clamp(0.65rem,5cqw,0.85rem)] leading-none text-ink-muted">last hour</span>
      <div className="relative min-h-0 flex-1">
        <svg viewBox={`0 0 ${W} ${H}`} preserveAspectRatio="none" aria-hidden="true" className="absolute inset-0 h-full w-full">
          <rect x={0} width={W} y={y(hi)} height={y(lo) - y(hi)} fill="var(--fs-chart-band)" />
          {[lo, hi].map((v) => (
            <line key={v} x1={0} x2={W} y1={y(v)} y2={y(v)} stroke="var(--fs-line-strong)" strokeWidth={1} strokeDasharray="3 3" vectorEffect="non-scaling-stroke" />
          ))}
          <path d={path} fill="none" stroke={muted ? 'var(--fs-offline-ink)' : 'var(--fs-chart-line)'} strokeWidth={1.5} strokeLinejoin="round" vectorEffect="non-scaling-stroke" />
        </svg>
      </div>
    </div>
  );
}
