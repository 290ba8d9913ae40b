import type { BandPosition } from '../../lib/redox-view';

// Literal class names (Tailwind reads them from the source): the chip takes the colour of the
// tank's worst sounding alarm; out of band with no alarm yet (on-delay) is outlined in ink.
const TONE: Record<1 | 2 | 3, string> = {
  1: 'bg-attention-1-soft text-attention-1-ink border-l-4 border-attention-1',
  2: 'bg-attention-2-soft text-attention-2-ink border-l-2 border-attention-2',
  3: 'bg-attention-3-soft text-attention-3-ink border border-attention-3',
};
const NO_ALARM = 'border border-line-strong text-ink';

/** Out of band in shape (▼/▲) and words, coloured by the alarm priority. In band stays neutral and quiet. */
export function BandState({ position, priority = null, className = '' }: { position: BandPosition; priority?: 1 | 2 | 3 | null; className?: string }) {
  if (position === 'in') return <span className={`text-ink-muted ${className}`}>In band</span>;
  const below = position === 'below';
  return (
    <span
      data-testid="band-state"
      data-priority={priority ?? ''}
      className={`inline-flex items-center gap-1 rounded-sm px-1.5 font-semibold ${priority ? TONE[priority] : NO_ALARM} ${className}`}
    >
      <span aria-hidden="true">{below ? '▼' : '▲'}</span>
      {below ? 'Below band' : 'Above band'}
    </span>
  );
}
