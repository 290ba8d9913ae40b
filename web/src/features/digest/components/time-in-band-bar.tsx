import type { BandMinutes } from '@shared/digest/time-in-band';
import { FILL } from './band-patterns';
import { formatPercent } from './digest-format';

const ORDER = ['below', 'inBand', 'above', 'noData'] as const;
const WORDS = { inBand: 'in band', above: 'above', below: 'below', noData: 'no data' } as const;

/** One tank's minutes as a stacked bar, below | in band | above | no data; full width is the whole range. */
export function TimeInBandBar({ tag, minutes }: { tag: string; minutes: BandMinutes }) {
  const total = Math.max(1, minutes.total);
  const label = `${tag}: ${ORDER.map((k) => `${WORDS[k]} ${formatPercent(minutes[k], minutes.total)}%`).join(', ')}`;
  return (
    <div role="img" aria-label={label} className="flex h-5 w-full overflow-hidden border border-line-strong" data-testid="tib-bar">
      {ORDER.map((k) => (minutes[k] > 0 ? <span key={k} className="h-full" style={{ ...FILL[k], width: `${(minutes[k] / total) * 100}%` }} /> : null))}
    </div>
  );
}
