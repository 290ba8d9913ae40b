import type { AlarmSpan } from '@shared/schemas/digest';
import { formatDateTime } from '../../../lib/format';
import { alarmKindLabel, formatSeconds } from './digest-format';

const MAX_LANES = 40;
const FILL: Record<number, { fill: string; stroke: string; h: number }> = {
  1: { fill: 'var(--fs-a1-fill)', stroke: 'var(--fs-a1-ink)', h: 10 },
  2: { fill: 'var(--fs-a2-fill)', stroke: 'var(--fs-a2-ink)', h: 8 },
  3: { fill: 'none', stroke: 'var(--fs-a3)', h: 8 },
};

type Props = { alarms: AlarmSpan[]; fromMs: number; toMs: number; timeZone: string };

/**
 * One lane per alarm across the range: the bar runs from raised to cleared (or the end), a
 * solid tick marks the acknowledgement and a dashed one the shelving. Priority shows as the
 * lane's "P1/P2/P3" text and the bar's weight, not by colour alone.
 */
export function AlarmTimeline({ alarms, fromMs, toMs, timeZone }: Props) {
  const span = Math.max(1, toMs - fromMs);
  const pct = (iso: string | null, fallback: number) => Math.min(100, Math.max(0, (((iso ? Date.parse(iso) : fallback) - fromMs) / span) * 100));
  const ticks = [0, 0.25, 0.5, 0.75, 1].map((f) => fromMs + f * span);
  const lanes = alarms.slice(0, MAX_LANES);
  return (
    <figure aria-label="Alarm timeline" className="flex flex-col gap-0.5">
      {lanes.map((a) => {
        const style = FILL[a.priority ?? 3] ?? FILL[3];
        const x0 = pct(a.raisedAt, fromMs);
        const x1 = pct(a.clearedAt, toMs);
        const ackS = a.acknowledgedAt ? (Date.parse(a.acknowledgedAt) - Date.parse(a.raisedAt)) / 1000 : null;
        const words = `P${a.priority ?? '?'} ${a.tankTag ?? ''} ${alarmKindLabel(a.kind)}, raised ${formatDateTime(a.raisedAt, timeZone)}` +
          (ackS !== null ? `, acknowledged after ${formatSeconds(ackS)}` : ', not acknowledged') + (a.shelvedAt ? ', shelved' : '') + (a.clearedAt ? ', cleared' : ', still open');
        return (
          <div key={a.id} className="grid grid-cols-[12rem_1fr] items-center gap-2 text-xs">
            <span className="truncate font-semibold tabular-nums">
              P{a.priority ?? '?'} · {a.tankTag} <span className="font-normal text-ink-muted">{alarmKindLabel(a.kind)}</span>
            </span>
            <svg viewBox="0 0 100 12" preserveAspectRatio="none" role="img" aria-label={words} className="block h-3.5 w-full">
              <line x1={0} x2={100} y1={6} y2={6} stroke="var(--fs-line)" strokeWidth={1} vectorEffect="non-scaling-stroke" />
              <rect x={x0} width={Math.max(0.4, x1 - x0)} y={6 - style.h / 2} height={style.h} fill={style.fill} stroke={style.stroke}
                strokeWidth={a.priority === 3 ? 1.5 : 0.5} vectorEffect="non-scaling-stroke" />
              {a.acknowledgedAt && <line x1={pct(a.acknowledgedAt, toMs)} x2={pct(a.acknowledgedAt, toMs)} y1={0} y2={12} stroke="var(--fs-ink)" strokeWidth={2.5} vectorEffect="non-scaling-stroke" />}
              {a.shelvedAt && <line x1={pct(a.shelvedAt, toMs)} x2={pct(a.shelvedAt, toMs)} y1={0} y2={12} stroke="var(--fs-ink)" strokeWidth={1.5} strokeDasharray="2 2" vectorEffect="non-scaling-stroke" />}
            </svg>
          </div>
        );
      })}
      <div className="grid grid-cols-[12rem_1fr] gap-2 text-xs text-ink-muted">
        <span />
        <div className="relative h-4">
          {ticks.map((tMs, i) => (
            <span key={tMs} className="absolute top-0 whitespace-nowrap tabular-nums" style={{ left: `${i * 25}%`, transform: i === 0 ? 'none' : i === 4 ? 'translateX(-100%)' : 'translateX(-50%)' }}>
              {formatDateTime(tMs, timeZone).slice(5)}
            </span>
          ))}
        </div>
      </div>
      {alarms.length > MAX_LANES && <figcaption className="text-xs text-ink-muted">First {MAX_LANES} of {alarms.length} alarms drawn; all are in the table.</figcaption>}
      <figcaption className="text-xs text-ink-muted">Bar: raised → cleared. Solid tick: acknowledged. Dashed tick: shelved.</figcaption>
    </figure>
  );
}
