import { formatAge } from '../../lib/format';
import type { FreshnessView } from '../../lib/freshness';

/** "12 s ago" while fresh; "Stale · 4 min ago" struck through in grey when not. */
export function FreshnessLabel({ freshness, className = '' }: { freshness: FreshnessView; className?: string }) {
  if (freshness.ageS == null) return <span className={`text-offline-ink ${className}`}>No reading yet</span>;
  if (freshness.stale) {
    return (
      <span className={`text-offline-ink ${className}`}>
        <span className="font-semibold">Stale</span> · <s>{formatAge(freshness.ageS)}</s>
      </span>
    );
  }
  return <span className={`text-ink-muted ${className}`}>{formatAge(freshness.ageS)}</span>;
}
