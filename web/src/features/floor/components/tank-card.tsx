import { Link } from 'react-router-dom';
import type { TankSummary } from '@shared/schemas/plant';
import { BandBar } from '../../../components/ui/band-bar';
import { BandState } from '../../../components/ui/band-state';
import { FreshnessLabel } from '../../../components/ui/freshness-label';
import { formatRatio } from '../../../lib/format';
import { useTankAlarm, useTankHeldAlarms } from '../../../lib/tank-alarms';
import { describe, TileAlarm } from './tank-tile';
import type { TankStatus } from './tank-status';
import { marksText, tileLook } from './tile-look';
import { TileMarks } from './tile-marks';

/** A tank as one compact card for narrow screens: the same frame, pill, marks and band as its tile. */
export function TankCard({ tank, status, nowMs, circuitName }: { tank: TankSummary; status: TankStatus; nowMs: number; circuitName: string }) {
  const alarm = useTankAlarm(tank.id);
  const held = useTankHeldAlarms(tank.id);
  const { frame, priority, marks } = tileLook(status, alarm, held);
  const stale = status.kind === 'stale';
  const latest = tank.latest;
  const quiet = status.kind === 'offline' || status.kind === 'no-probe' || status.kind === 'no-reading';

  return (
    <Link
      to={`/tanks/${tank.id}`}
      aria-label={`${alarm ? `Priority ${alarm.priority} alarm: ${alarm.label}. ` : ''}${describe(tank, status)}${marksText(marks)}`}
      data-testid="tank-card"
      data-tag={tank.tag}
      data-priority={priority ?? ''}
      className={`flex min-w-0 flex-col gap-1.5 rounded-lg bg-panel p-3 hover:bg-panel-2 ${frame}`}
    >
      <div className="flex min-w-0 items-baseline gap-2">
        <span className="text-2xl font-bold leading-none">{tank.tag}</span>
        <span className="truncate text-sm text-ink-muted">
          {tank.name} · {circuitName}
        </span>
        {alarm && <TileAlarm alarm={alarm} />}
      </div>
      {quiet ? (
        <div className="font-semibold text-offline-ink">
          {status.kind === 'offline' ? 'Out of service' : status.kind === 'no-probe' ? 'No probe fitted' : 'No reading yet'}
        </div>
      ) : (
        <div className="flex flex-wrap items-baseline gap-x-2 gap-y-1">
          <span className={`text-3xl font-bold leading-none tabular-nums ${stale ? 'text-offline-ink line-through' : ''}`}>{formatRatio(latest?.ratio)}</span>
          <span className="text-sm text-ink-muted">Fe³⁺/Fe²⁺</span>
          {stale ? <span className="text-offline-ink">Not live</span> : status.position && <BandState position={status.position} priority={priority} />}
          <span className="ml-auto text-sm">
            <FreshnessLabel freshness={status.freshness} />
          </span>
        </div>
      )}
      <TileMarks marks={marks} held={held} nowMs={nowMs} />
      {!quiet && <BandBar band={tank.band} ratio={latest?.ratio ?? null} factor={status.factor} attention={status.position !== 'in' ? priority : null} muted={stale} aspect={14} />}
    </Link>
  );
}
