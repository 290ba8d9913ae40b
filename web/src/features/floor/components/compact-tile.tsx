import { memo } from 'react';
import { Link } from 'react-router-dom';
import type { TankSummary } from '@shared/schemas/plant';
import { BandState } from '../../../components/ui/band-state';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { formatRatio } from '../../../lib/format';
import type { TankAlarmBadge, TankHeldAlarms } from '../../../lib/tank-alarms';
import { describe } from './tank-tile';
import type { TankStatus } from './tank-status';
import { marksText, tileLook } from './tile-look';

type Props = { tank: TankSummary; status: TankStatus; alarm: TankAlarmBadge | undefined; held: TankHeldAlarms | undefined };

/**
 * A tank as a small tile for large plants: tag, ratio, band state and the worst alarm, with the
 * same frame and marks as the full tile. It leaves out the age and the trend, so it repaints only
 * when its reading, state or alarms change, not on every clock tick.
 */
function CompactTileView({ tank, status, alarm, held }: Props) {
  const { frame, priority, marks } = tileLook(status, alarm, held);
  const stale = status.kind === 'stale';
  const quiet = status.kind === 'offline' || status.kind === 'no-probe' || status.kind === 'no-reading';
  return (
    <Link
      to={`/tanks/${tank.id}`}
      aria-label={`${alarm ? `Priority ${alarm.priority} alarm: ${alarm.label}. ` : ''}${describe(tank, status)}${marksText(marks)}`}
      data-testid="tank-tile"
      data-compact="true"
      data-tag={tank.tag}
      data-ts={tank.latest?.ts ?? ''}
      data-priority={priority ?? ''}
      data-stale={stale ? 'true' : 'false'}
      className={`flex h-full min-w-0 flex-col justify-between gap-1 rounded-md bg-panel px-2 py-1.5 hover:bg-panel-2 ${frame}`}
    >
      <div className="flex min-w-0 items-center gap-1">
        <span className="truncate text-sm font-bold leading-none">{tank.tag}</span>
        {alarm && (
          <span className="ml-auto shrink-0">
            <PriorityPill priority={alarm.priority} pulse={alarm.unacknowledged > 0} />
          </span>
        )}
        {!alarm && marks.length > 0 && (
          <span className="ml-auto shrink-0 text-xs text-ink-muted" title={marksText(marks).trim()}>
            {marks.includes('shelved') ? '◷' : '▨'}
          </span>
        )}
      </div>
      {quiet ? (
        <span className="text-xs font-semibold text-offline-ink">
          {status.kind === 'offline' ? 'Out of service' : status.kind === 'no-probe' ? 'No probe' : 'No reading'}
        </span>
      ) : (
        <div className="flex items-baseline justify-between gap-1">
          <span className={`text-xl font-bold leading-none tabular-nums ${stale ? 'text-offline-ink line-through' : ''}`}>{formatRatio(tank.latest?.ratio)}</span>
          <span className="truncate text-xs">{stale ? <span className="text-offline-ink">Not live</span> : status.position && <BandState position={status.position} priority={priority} />}</span>
        </div>
      )}
    </Link>
  );
}

/** Repaints only for what the tile shows: the reading, its state and its alarms (not the clock). */
export const CompactTile = memo(CompactTileView, (a, b) =>
  a.tank === b.tank &&
  a.alarm === b.alarm &&
  a.held === b.held &&
  a.status.kind === b.status.kind &&
  a.status.position === b.status.position &&
  a.status.outsideRange === b.status.outsideRange,
);
