import type { AlarmView } from '@shared/schemas/alarms';
import { Button } from '../../../components/ui/button';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { useNow } from '../../../lib/clock';
import { formatAge, formatDateTime } from '../../../lib/format';
import { AlarmStateLabel } from './alarm-state-label';
import { isUnacknowledged, valueText } from './alarm-states';

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
  /** History rows are closed episodes: no age column, no actions. */
  mode?: 'active' | 'history';
};

export function AlarmTable({ alarms, selectedId, timeZone, canAck, onSelect, onAcknowledge, mode = 'active' }: Props) {
  const now = useNow();
  return (
    <table className="w-full border-collapse text-left text-sm" data-testid={`alarm-table-${mode}`}>
      <thead className="text-xs text-ink-muted">
        <tr className="border-b border-line">
          <th className="py-2 pr-2 font-semibold">Priority</th>
          <th className="pr-2 font-semibold">State</th>
          <th className="pr-2 font-semibold">Tank</th>
          <th className="pr-2 font-semibold">Alarm</th>
          <th className="pr-2 text-right font-semibold">At activation</th>
          <th className="pr-2 text-right font-semibold">{mode === 'active' ? 'Since' : 'Opened'}</th>
          {mode === 'active' && <th className="font-semibold"><span className="sr-only">Actions</span></th>}
        </tr>
      </thead>
      <tbody>
        {alarms.map((a) => (
          <tr
            key={a.id}
            data-testid="alarm-row"
            data-alarm-id={a.id}
            data-tank={a.tankTag}
            aria-selected={a.id === selectedId}
            onClick={() => onSelect(a.id)}
            className={`cursor-pointer border-b border-line hover:bg-panel-2 ${a.id === selectedId ? 'bg-panel-2 shadow-[inset_3px_0_0_var(--fs-info)]' : ''}`}
          >
            <td className="py-2 pr-2"><PriorityPill priority={a.priority} pulse={isUnacknowledged(a.state)} /></td>
            <td className="pr-2"><AlarmStateLabel state={a.state} shelvedUntil={a.shelvedUntil} timeZone={timeZone} /></td>
            <td className="pr-2 font-bold">{a.tankTag}</td>
            <td className="pr-2">
              <button type="button" className="text-left hover:underline" onClick={(e) => (e.stopPropagation(), onSelect(a.id))}>{a.label}</button>
            </td>
            <td className="pr-2 text-right tabular-nums">{valueText(a, a.firstValue, a.limitValue)}</td>
            <td className="pr-2 text-right tabular-nums text-ink-muted">
              {mode === 'active' ? formatAge((now - since(a)) / 1000).replace(' ago', '') : formatDateTime(a.openedAt, timeZone)}
            </td>
            {mode === 'active' && (
              <td className="py-1 text-right">
                {canAck && isUnacknowledged(a.state) && onAcknowledge && (
                  <Button size="sm" onClick={(e) => (e.stopPropagation(), onAcknowledge(a.id))} aria-label={`Acknowledge ${a.tankTag} ${a.label}`}>
                    Acknowledge
                  </Button>
                )}
              </td>
            )}
          </tr>
        ))}
      </tbody>
    </table>
  );
}
