import type { BandSpanView, TankDigest } from '@shared/schemas/digest';
import { formatRatio } from '../../../lib/format';

const W = 240;
const H = 40;

/**
 * The ratio over the range on a log scale, with the band in force shaded behind it (each band
 * span where it applied). Gaps stay gaps. The vertical domain is set by the band, widened to
 * the data, so tanks with the same band compare at a glance.
 */
export function RatioSparkline({ tank, fromMs, toMs }: { tank: TankDigest; fromMs: number; toMs: number }) {
  const { t, logRatio } = tank.spark;
  const lows = tank.bands.map((b) => Math.log10(b.low));
  const highs = tank.bands.map((b) => Math.log10(b.high));
  const values = logRatio.filter((v): v is number => v !== null);
  const lo = Math.min(...lows, ...values) - 0.15;
  const hi = Math.max(...highs, ...values) + 0.15;
  const x = (sec: number) => ((sec * 1000 - fromMs) / Math.max(1, toMs - fromMs)) * W;
  const y = (lr: number) => H - ((lr - lo) / Math.max(1e-9, hi - lo)) * H;

  let d = '';
  let pen = false;
  logRatio.forEach((v, i) => {
    if (v === null) return void (pen = false);
    d += `${pen ? 'L' : 'M'}${x(t[i]).toFixed(1)} ${y(v).toFixed(1)} `;
    pen = true;
  });
  const spanEnd = (i: number) => (i + 1 < tank.bands.length ? Date.parse(tank.bands[i + 1].from) / 1000 : toMs / 1000);
  const label = tank.ratio
    ? `${tank.tag} ratio, geometric mean ${formatRatio(tank.ratio.mean)}, range ${formatRatio(tank.ratio.min)} to ${formatRatio(tank.ratio.max)}`
    : `${tank.tag}: no data`;

  if (values.length === 0) return <span className="text-sm text-ink-muted">no data</span>;
  return (
    <svg viewBox={`0 0 ${W} ${H}`} preserveAspectRatio="none" role="img" aria-label={label} className="block h-10 w-full">
      {tank.bands.map((b: BandSpanView, i) => (
        <rect key={b.from} x={x(Date.parse(b.from) / 1000)} width={Math.max(0, x(spanEnd(i)) - x(Date.parse(b.from) / 1000))}
          y={y(Math.log10(b.high))} height={Math.max(0, y(Math.log10(b.low)) - y(Math.log10(b.high)))} fill="var(--fs-chart-band)" stroke="var(--fs-info)" strokeWidth={0.5} strokeDasharray="3 2" vectorEffect="non-scaling-stroke" />
      ))}
      <path d={d} fill="none" stroke="var(--fs-chart-line)" strokeWidth={1.4} vectorEffect="non-scaling-stroke" strokeLinejoin="round" />
    </svg>
  );
}
