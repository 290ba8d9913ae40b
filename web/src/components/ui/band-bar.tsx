import type { Band } from '@shared/schemas/plant';
import { formatRatio } from '../../lib/format';

type BandBarProps = {
  band: Band;
  ratio: number | null;
  /** Uncertainty factor: the whisker spans ratio ÷ factor … ratio × factor. */
  factor: number | null;
  /** The priority of the tank's worst sounding alarm: the marker takes its colour (text and shape carry it too). */
  attention?: 1 | 2 | 3 | null;
  /** Stale or offline: marker hollow and grey. */
  muted?: boolean;
  /** Width : height of the drawing; match the space it gets so shapes are not stretched. */
  aspect?: number;
  className?: string;
};

const H = 28;
const TRACK_Y = 17;

/**
 * Where the ratio sits on a logarithmic scale around its band. The domain is fixed by the
 * band (not the value), so the marker moves visibly as the ratio changes; values beyond it
 * pin to the edge with an arrow.
 */
export function BandBar({ band, ratio, factor, attention = null, muted = false, aspect = 7, className = '' }: BandBarProps) {
  const W = Math.round(H * aspect);
  const lo = Math.log10(band.low);
  const hi = Math.log10(band.high);
  const pad = Math.max(0.3, (hi - lo) * 0.6);
  const d0 = lo - pad;
  const d1 = hi + pad;
  const x = (r: number) => ((Math.log10(r) - d0) / (d1 - d0)) * W;
  const clampX = (v: number) => Math.max(0, Math.min(W, v));

  const valid = ratio != null && Number.isFinite(ratio) && ratio > 0;
  const mx = valid ? x(ratio) : null;
  const offLeft = mx != null && mx < 0;
  const offRight = mx != null && mx > W;
  const markerColour = muted ? 'var(--fs-offline-ink)' : attention ? `var(--fs-a${attention})` : 'var(--fs-ink)';

  const label = valid
    ? `Ratio ${formatRatio(ratio)} on a band of ${formatRatio(band.low)} to ${formatRatio(band.high)}${factor ? `, uncertain by a factor of ${factor.toFixed(2)}` : ''}`
    : `Band ${formatRatio(band.low)} to ${formatRatio(band.high)}, no current value`;

  return (
    <svg viewBox={`0 0 ${W} ${H}`} role="img" aria-label={label} className={`block w-full ${className}`}>
      <line x1={0} x2={W} y1={TRACK_Y} y2={TRACK_Y} stroke="var(--fs-line-strong)" strokeWidth={1} vectorEffect="non-scaling-stroke" />
      <rect x={x(band.low)} width={x(band.high) - x(band.low)} y={TRACK_Y - 5} height={10} fill="var(--fs-line-strong)" opacity={0.45} />
      {band.target != null && (
        <line x1={x(band.target)} x2={x(band.target)} y1={TRACK_Y - 6} y2={TRACK_Y + 6} stroke="var(--fs-ink-muted)" strokeWidth={1.5} vectorEffect="non-scaling-stroke" />
      )}
      {mx != null && factor != null && !offLeft && !offRight && (
        <g stroke={markerColour} strokeWidth={1.5} vectorEffect="non-scaling-stroke">
          <line x1={clampX(x(ratio! / factor))} x2={clampX(x(ratio! * factor))} y1={TRACK_Y} y2={TRACK_Y} vectorEffect="non-scaling-stroke" />
          <line x1={clampX(x(ratio! / factor))} x2={clampX(x(ratio! / factor))} y1={TRACK_Y - 3} y2={TRACK_Y + 3} vectorEffect="non-scaling-stroke" />
          <line x1={clampX(x(ratio! * factor))} x2={clampX(x(ratio! * factor))} y1={TRACK_Y - 3} y2={TRACK_Y + 3} vectorEffect="non-scaling-stroke" />
        </g>
      )}
      {mx != null && !offLeft && !offRight && (
        // A downward triangle sitting on the track: shape, not only colour.
        <path
          d={`M ${mx - 6} 2 L ${mx + 6} 2 L ${mx} ${TRACK_Y - 1} Z`}
          fill={muted ? 'none' : markerColour}
          stroke={markerColour}
          strokeWidth={1.5}
          vectorEffect="non-scaling-stroke"
        />
      )}
      {offLeft && <path d={`M 0 ${TRACK_Y} L 10 ${TRACK_Y - 8} L 10 ${TRACK_Y + 8} Z`} fill={markerColour} />}
      {offRight && <path d={`M ${W} ${TRACK_Y} L ${W - 10} ${TRACK_Y - 8} L ${W - 10} ${TRACK_Y + 8} Z`} fill={markerColour} />}
    </svg>
  );
}
