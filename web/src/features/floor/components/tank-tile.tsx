import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import type { TankSummary } from '@shared/schemas/plant';
import { BandBar } from '../../../components/ui/band-bar';
import { BandState } from '../../../components/ui/band-state';
import { FreshnessLabel } from '../../../components/ui/freshness-label';
import { Quantity } from '../../../components/ui/quantity';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { useTankAlarm, useTankHeldAlarms, type TankAlarmBadge } from '../../../lib/tank-alarms';
import { formatAge, formatEhV, formatMv, formatMvRange, formatRatio, formatTempC } from '../../../lib/format';
import type { TankStatus } from './tank-status';
import { marksText, tileLook } from './tile-look';
import { TileMarks } from './tile-marks';
import { TileSparkline } from './tile-sparkline';

// Type scales with the tile (container units), so one layout serves a 1920×1080 wall and a 1366×768 laptop.
const TAG = 'text-[length:clamp(1.1rem,min(15cqw,11cqh),3.25rem)]';
const RATIO = 'text-[length:clamp(1.6rem,min(28cqw,19cqh),5.5rem)]';
const DETAIL = 'text-[length:clamp(0.8rem,min(7.6cqw,4.5cqh),1.5rem)]';

export function describe(tank: TankSummary, status: TankStatus): string {
  const parts = [`Tank ${tank.tag}, ${tank.name}`];
  if (status.kind === 'offline') parts.push('out of service');
  else if (status.kind === 'no-probe') parts.push('no probe fitted');
  else if (status.kind === 'no-reading') parts.push('no reading yet');
  else if (tank.latest) {
    parts.push(`ratio ${formatRatio(tank.latest.ratio)}`);
    if (status.position) parts.push(status.position === 'in' ? 'in band' : `${status.position} band`);
    if (status.probeSuspect) parts.push('probe suspect: failed its last check');
    if (status.kind === 'stale' && status.freshness.ageS != null) parts.push(`stale, last reading ${formatAge(status.freshness.ageS)}`);
  }
  return `${parts.join(', ')}. Open tank page.`;
}

/** Worst open alarm of the tank: pill by priority (shape + text), count, pulsing while unacknowledged. */
export function TileAlarm({ alarm }: { alarm: TankAlarmBadge }) {
  return (
    <span className="ml-auto flex shrink-0 items-center gap-1" data-testid="tile-alarm" data-priority={alarm.priority} data-unack={alarm.unacknowledged} title={alarm.label}>
      <PriorityPill priority={alarm.priority} pulse={alarm.unacknowledged > 0} />
      {alarm.count > 1 && <span className="text-xs font-semibold text-ink-muted">+{alarm.count - 1}</span>}
    </span>
  );
}

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="flex items-baseline justify-between gap-2">
      <dt className="text-ink-muted">{label}</dt>
      <dd className="text-right">{children}</dd>
    </div>
  );
}

export function TankTile({ tank, status, nowMs }: { tank: TankSummary; status: TankStatus; nowMs: number }) {
  const latest = tank.latest;
  const alarm = useTankAlarm(tank.id);
  const held = useTankHeldAlarms(tank.id);
  const stale = status.kind === 'stale';
  const { frame, priority, marks } = tileLook(status, alarm, held);

  return (
    <Link
      to={`/tanks/${tank.id}`}
      aria-label={`${alarm ? `Priority ${alarm.priority} alarm: ${alarm.label}. ` : ''}${describe(tank, status)}${marksText(marks)}`}
      data-testid="tank-tile"
      data-tag={tank.tag}
      data-ts={latest?.ts ?? ''}
      data-priority={priority ?? ''}
      data-stale={stale ? 'true' : 'false'}
      className={`tile-box block h-full min-w-0 overflow-hidden rounded-lg bg-panel hover:bg-panel-2 ${frame}`}
    >
      <div className="flex h-full flex-col gap-[1.6cqh] p-[5cqw]">
        <div className="flex min-w-0 items-baseline gap-2">
          <span className={`font-bold leading-none tracking-tight ${TAG}`}>{tank.tag}</span>
          <span className={`truncate text-ink-muted ${DETAIL}`}>{tank.name}</span>
          {alarm && <TileAlarm alarm={alarm} />}
        </div>
        <TileMarks marks={marks} held={held} nowMs={nowMs} />

        {status.kind === 'offline' || status.kind === 'no-probe' || status.kind === 'no-reading' ? (
          <div className={`mt-[4cqh] font-semibold text-offline-ink ${DETAIL}`}>
            {status.kind === 'offline' ? 'Out of service' : status.kind === 'no-probe' ? 'No probe fitted' : 'No reading yet'}
          </div>
        ) : (
          <>
            <div className="flex items-baseline gap-2">
              <span
                data-testid="tile-ratio"
                className={`font-bold leading-none tabular-nums ${RATIO} ${stale ? 'text-offline-ink line-through' : ''}`}
              >
                {formatRatio(latest?.ratio)}
              </span>
              <span className={`text-ink-muted ${DETAIL}`}>Fe³⁺/Fe²⁺</span>
            </div>
            <div className={DETAIL}>
              {stale ? (
                <span className="text-offline-ink">Not live</span>
              ) : (
                status.position && <BandState position={status.position} priority={priority} />
              )}
              {status.outsideRange && (
                <span className="ml-2 font-semibold text-attention-3-ink">
                  <span aria-hidden="true">◆ </span>Outside calibrated range
                </span>
              )}
              {status.probeSuspect && (
                <span className="ml-2 font-semibold text-attention-2-ink" data-testid="tile-suspect">
                  <span aria-hidden="true">▲ </span>Probe suspect
                </span>
              )}
            </div>
            <BandBar band={tank.band} ratio={latest?.ratio ?? null} factor={status.factor} attention={status.position !== 'in' ? priority : null} muted={stale} />
            <div className="min-h-0 flex-1">
              <TileSparkline tankId={tank.id} band={tank.band} latest={latest} nowMs={nowMs} muted={stale} />
            </div>
          </>
        )}

        <div className={`mt-auto leading-tight ${DETAIL}`}>
        <dl className="flex flex-col gap-[0.5cqh]">
          {latest && status.kind !== 'offline' && (
            <>
              <Row label="ORP">
                <Quantity value={formatMv(latest.orpMv)} unit="mV" struck={stale} />
              </Row>
              <Row label="Eh">
                <Quantity value={formatEhV(latest.ehV)} unit="V" struck={stale} />
              </Row>
              <Row label="Temp">
                <Quantity value={formatTempC(latest.tempC)} unit="°C" struck={stale} />
              </Row>
            </>
          )}
          <Row label="Band">
            {status.bandMv && status.kind !== 'offline' ? (
              <Quantity value={formatMvRange(status.bandMv.lowMv, status.bandMv.highMv)} unit="mV" />
            ) : (
              <Quantity value={`${formatRatio(tank.band.low)}–${formatRatio(tank.band.high)}`} />
            )}
          </Row>
        </dl>
        {status.kind !== 'offline' && status.kind !== 'no-probe' && (
          <div className="pt-[0.8cqh]" data-testid="tile-freshness">
            <FreshnessLabel freshness={status.freshness} />
          </div>
        )}
        </div>
      </div>
    </Link>
  );
}
