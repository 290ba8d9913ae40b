import type { AlarmView } from '@shared/schemas/alarms';
import type { TankLive } from '@shared/schemas/readings';
import { Button } from '../../../components/ui/button';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { useNow } from '../../../lib/clock';
import { formatDateTime, formatDuration } from '../../../lib/format';
import { useMediaQuery } from '../../../lib/use-media-query';
import { AlarmStateLabel } from './alarm-state-label';
import { isUnacknowledged, nowText, placeOf, valueText } from './alarm-states';

const since = (a: AlarmView) => Date.parse(a.activatedAt ?? a.openedAt);

/** Highest priority first, newest first within a priority (new arrivals show at the top of their group). */
export const deskOrder = (a: AlarmView, b: AlarmView) => a.priority - b.priority || since(b) - since(a) || b.id - a.id;

type Props = {
  alarms: AlarmView[];
  selectedId: number | null;
  timeZone: string;
  canAck: boolean;
  onSelect: (id: number) => void;
  onAcknowledge?: (id: number) => void;
  /** Newest values per tank, for the value now beside the value at activation. */
  latest?: ReadonlyMap<number, TankLive | null>;
  /** History rows are closed episodes: no age column, no actions. */
  mode?: 'active' | 'history';
};

/** What tests and assistive tech find on a row or card alike. */
const rowProps = (a: AlarmView, selectedId: number | null) => ({ 'data-testid': 'alarm-row', 'data-alarm-id': a.id, 'data-tank': placeOf(a), 'aria-selected': a.id === selectedId });

function AckButton({ a, onAcknowledge }: { a: AlarmView; onAcknowledge: (id: number) => void }) {
  return (
    <Button size="sm" variant="primary" onClick={(e) => (e.stopPropagation(), onAcknowledge(a.id))} aria-label={`Acknowledge ${placeOf(a)} ${a.label}`}>
      Acknowledge
    </Button>
  );
}

/** The open alarms as a table on wide screens and as cards, acknowledge button included, on narrow ones. */
export function AlarmTable(props: Props) {
  const wide = useMediaQuery('(min-width: 1024px)');
  return wide ? <Table {...props} /> : <Cards {...props} />;
}

function Table({ alarms, selectedId, timeZone, canAck, onSelect, onAcknowledge, latest, mode = 'active' }: Props) {
  const now = useNow();
  return (
    <table className="w-full border-collapse text-left text-sm" data-testid={`alarm-table-${mode}`}>
      <thead className="text-xs text-ink-muted">
        <tr className="border-b border-line">
          <th className="py-2 pr-2 font-semibold">Priority</th>
          <th className="pr-2 font-semibold">State</th>
          <th className="pr-2 font-semibold">Tank</th>
          <th className="pr-2 font-semibold">Alarm</th>
          {mode === 'active' && <th className="pr-2 text-right font-semibold">Now</th>}
          <th className="pr-2 text-right font-semibold">At activation</th>
          <th className="pr-2 text-right font-semibold">{mode === 'active' ? 'For' : 'Opened'}</th>
          {mode === 'active' && <th className="font-semibold"><span className="sr-only">Actions</span></th>}
        </tr>
      </thead>
      <tbody>
        {alarms.map((a) => (
          <tr
            key={a.id}
            {...rowProps(a, selectedId)}
            onClick={() => onSelect(a.id)}
            className={`cursor-pointer border-b border-line hover:bg-panel-2 ${a.id === selectedId ? 'bg-panel-2 shadow-[inset_3px_0_0_var(--fs-info)]' : ''}`}
          >
            <td className="py-2 pr-2"><PriorityPill priority={a.priority} pulse={isUnacknowledged(a.state)} /></td>
            <td className="pr-2"><AlarmStateLabel state={a.state} shelvedUntil={a.shelvedUntil} timeZone={timeZone} /></td>
            <td className="pr-2 font-bold">{placeOf(a)}</td>
            <td className="pr-2">
              <button type="button" className="text-left hover:underline" onClick={(e) => (e.stopPropagation(), onSelect(a.id))}>{a.label}</button>
            </td>
            {mode === 'active' && <td className="pr-2 text-right font-semibold tabular-nums" data-testid="alarm-now">{nowText(a, a.tankId === null ? null : latest?.get(a.tankId)) ?? '—'}</td>}
            <td className="pr-2 text-right tabular-nums">{valueText(a, a.firstValue, a.limitValue)}</td>
            <td className="pr-2 text-right tabular-nums text-ink-muted">
              {mode === 'active' ? formatDuration((now - since(a)) / 1000) : formatDateTime(a.openedAt, timeZone)}
            </td>
            {mode === 'active' && (
              <td className="py-1 text-right">{canAck && isUnacknowledged(a.state) && onAcknowledge && <AckButton a={a} onAcknowledge={onAcknowledge} />}</td>
            )}
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function Cards({ alarms, selectedId, timeZone, canAck, onSelect, onAcknowledge, latest, mode = 'active' }: Props) {
  const now = useNow();
  return (
    <ul className="flex flex-col gap-2" data-testid={`alarm-cards-${mode}`}>
      {alarms.map((a) => {
        const live = mode === 'active' ? nowText(a, a.tankId === null ? null : latest?.get(a.tankId)) : null;
        return (
          <li
            key={a.id}
            {...rowProps(a, selectedId)}
            className={`flex min-w-0 flex-col gap-1.5 rounded-md border border-line p-3 ${a.id === selectedId ? 'bg-panel-2 shadow-[inset_3px_0_0_var(--fs-info)]' : ''}`}
          >
            <div className="flex flex-wrap items-center gap-2">
              <PriorityPill priority={a.priority} pulse={isUnacknowledged(a.state)} />
              <span className="text-lg font-bold">{placeOf(a)}</span>
              <AlarmStateLabel state={a.state} shelvedUntil={a.shelvedUntil} timeZone={timeZone} />
            </div>
            <button type="button" className="text-left font-semibold underline-offset-2 hover:underline" onClick={() => onSelect(a.id)}>{a.label}</button>
            <dl className="grid grid-cols-[auto_1fr] gap-x-3 text-sm tabular-nums">
              {live && (<><dt className="text-ink-muted">Now</dt><dd className="font-semibold" data-testid="alarm-now">{live}</dd></>)}
              <dt className="text-ink-muted">At activation</dt>
              <dd>{valueText(a, a.firstValue, a.limitValue)}</dd>
              <dt className="text-ink-muted">{mode === 'active' ? 'For' : 'Opened'}</dt>
              <dd>{mode === 'active' ? formatDuration((now - since(a)) / 1000) : formatDateTime(a.openedAt, timeZone)}</dd>
            </dl>
            {mode === 'active' && canAck && isUnacknowledged(a.state) && onAcknowledge && (
              <div className="flex justify-end"><AckButton a={a} onAcknowledge={onAcknowledge} /></div>
            )}
          </li>
        );
      })}
    </ul>
  );
}
