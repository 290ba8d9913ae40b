import type { BandPosition } from '../../lib/redox-view';

/** Out of band in colour, shape (▼/▲) and words. In band stays neutral and quiet. */
export function BandState({ position, className = '' }: { position: BandPosition; className?: string }) {
  if (position === 'in') return <span className={`text-ink-muted ${className}`}>In band</span>;
  const below = position === 'below';
  return (
    <span
      className={`inline-flex items-center gap-1 rounded-sm bg-attention-2-soft px-1.5 font-semibold text-attention-2-ink ${className}`}
    >
      <span aria-hidden="true">{below ? '▼' : '▲'}</span>
      {below ? 'Below band' : 'Above band'}
    </span>
  );
}
