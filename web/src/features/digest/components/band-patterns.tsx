import type { CSSProperties } from 'react';

/**
 * Fills for the time-in-band pictures. Out of band and no data differ by pattern as well as
 * colour, so a grey printout still tells them apart. CSS backgrounds rather than SVG
 * patterns: a stretched bar would squash an SVG pattern, a CSS one keeps its shape.
 */
export const FILL = {
  inBand: { background: 'var(--fs-line-strong)' },
  above: { background: 'repeating-linear-gradient(45deg, var(--fs-a2-ink) 0 2px, var(--fs-a2-fill) 2px 6px)' },
  below: { background: 'radial-gradient(circle, var(--fs-a3-ink) 1.3px, var(--fs-a3-soft) 1.7px) 0 0 / 6px 6px' },
  noData: { background: 'repeating-linear-gradient(-45deg, var(--fs-offline) 0 1px, var(--fs-panel) 1px 6px)' },
} satisfies Record<string, CSSProperties>;

/** Legend swatch with its words. */
export function Swatch({ fill, label }: { fill: CSSProperties; label: string }) {
  return (
    <span className="inline-flex items-center gap-1.5 text-sm text-ink-muted">
      <span aria-hidden="true" className="inline-block h-3 w-5 border border-line-strong" style={fill} />
      {label}
    </span>
  );
}
