import { formatDuration } from '../../../lib/format';
import type { TankHeldAlarms } from '../../../lib/tank-alarms';
import type { TileMark } from './tile-look';

/** Small marks for alarms that are held back: a clock for shelved (with time left), a hatch for out of service. */
export function TileMarks({ marks, held, nowMs, className = '' }: { marks: TileMark[]; held?: TankHeldAlarms; nowMs: number; className?: string }) {
  if (marks.length === 0 || !held) return null;
  const left = held.shelvedUntil ? (Date.parse(held.shelvedUntil) - nowMs) / 1000 : null;
  return (
    <span className={`flex flex-wrap items-center gap-1 ${className}`} data-testid="tile-marks" data-marks={marks.join(' ')}>
      {marks.includes('shelved') && (
        <span className="inline-flex items-center gap-1 rounded-sm border border-line-strong px-1 text-xs font-semibold text-ink" data-testid="tile-mark-shelved"
          title={`${held.shelved} shelved alarm${held.shelved > 1 ? 's' : ''}`}>
          <svg viewBox="0 0 12 12" width="11" height="11" aria-hidden="true">
            <circle cx="6" cy="6" r="5" fill="none" stroke="currentColor" strokeWidth="1.5" />
            <path d="M6 3v3.2l2 1.3" fill="none" stroke="currentColor" strokeWidth="1.5" />
          </svg>
          Shelved{left != null && left > 0 ? ` · ${formatDuration(left)} left` : ''}
        </span>
      )}
      {marks.includes('out-of-service') && (
        <span className="hatch inline-flex items-center rounded-sm border border-dashed border-line-strong px-1 text-xs font-semibold text-offline-ink" data-testid="tile-mark-oos">
          Alarm out of service
        </span>
      )}
      {marks.includes('suppressed') && (
        <span className="hatch inline-flex items-center rounded-sm border border-dashed border-line-strong px-1 text-xs font-semibold text-offline-ink">Suppressed</span>
      )}
    </span>
  );
}
