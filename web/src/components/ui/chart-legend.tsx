import type { ReactNode } from 'react';

/**
 * Swatches drawn with the same CSS variables the canvas reads, so a legend always matches its
 * chart in either theme. Each item's shape repeats the mark: filled or open dot, line, dashed
 * edge, fill, diamond.
 */
export type LegendMark =
  | { kind: 'dot'; filled: boolean; colour: string }
  | { kind: 'line'; colour: string; dashed?: boolean }
  | { kind: 'fill'; colour: string; edge?: string }
  | { kind: 'diamond'; colour: string; fill: string };

function Swatch({ mark }: { mark: LegendMark }): ReactNode {
  const box = { width: 22, height: 12, viewBox: '0 0 22 12', 'aria-hidden': true } as const;
  switch (mark.kind) {
    case 'dot':
      return <svg {...box}><circle cx="11" cy="6" r="4" fill={mark.filled ? mark.colour : 'none'} stroke={mark.colour} strokeWidth="1.5" /></svg>;
    case 'line':
      return <svg {...box}><line x1="1" x2="21" y1="6" y2="6" stroke={mark.colour} strokeWidth="2" strokeDasharray={mark.dashed ? '4 3' : undefined} /></svg>;
    case 'fill':
      return (
        <svg {...box}>
          <rect x="1" y="1" width="20" height="10" fill={mark.colour} />
          {mark.edge && <path d="M1 1h20M1 11h20" stroke={mark.edge} strokeWidth="1" strokeDasharray="4 3" />}
        </svg>
      );
    case 'diamond':
      return <svg {...box}><path d="M11 1 16 6 11 11 6 6Z" fill={mark.fill} stroke={mark.colour} strokeWidth="1.5" /></svg>;
  }
}

export function ChartLegend({ items, label, className = '' }: { items: Array<{ label: string; mark: LegendMark }>; label: string; className?: string }) {
  return (
    <ul aria-label={label} className={`flex flex-wrap items-center gap-x-4 gap-y-1 text-sm text-ink-muted ${className}`} data-testid="chart-legend">
      {items.map((i) => (
        <li key={i.label} className="inline-flex items-center gap-1.5">
          <Swatch mark={i.mark} />
          {i.label}
        </li>
      ))}
    </ul>
  );
}
