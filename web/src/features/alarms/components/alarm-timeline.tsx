import type { AlarmEventView, AlarmView } from '@shared/schemas/alarms';
import { formatDateTime } from '../../../lib/format';
import { STATE_LABEL, valueText } from './alarm-states';

const WORDS: Record<string, string> = {
  activated: 'Condition active', cleared: 'Condition back to normal', acknowledged: 'Acknowledged', shelved: 'Shelved', unshelved: 'Unshelved',
  'removed-from-service': 'Taken out of service', 'returned-to-service': 'Returned to service', suppressed: 'Suppressed (tank offline)',
  unsuppressed: 'No longer suppressed', commented: 'Comment', escalated: 'Escalation',
};
const HOW: Record<AlarmEventView['how'], string> = { screen: 'on screen', email: 'via e-mail link', automatic: 'automatic' };

/** Every recorded event of one alarm, oldest first; the history is never rewritten, so neither is this list. */
export function AlarmTimeline({ alarm, events, timeZone }: { alarm: AlarmView; events: AlarmEventView[]; timeZone: string }) {
  return (
    <ol className="flex flex-col gap-2" data-testid="alarm-timeline">
      {events.map((e) => (
        <li key={e.id} className="border-l-2 border-line-strong pl-3 text-sm" data-kind={e.kind} data-how={e.how}>
          <div className="flex flex-wrap items-baseline gap-x-2">
            <span className="tabular-nums text-ink-muted">{formatDateTime(e.at, timeZone)}</span>
            <span className="font-semibold">{WORDS[e.kind] ?? e.kind}</span>
            {e.fromState !== e.toState && <span className="text-ink-muted">→ {STATE_LABEL[e.toState]}</span>}
          </div>
          <div className="text-ink-muted">
            {e.byName ?? 'Ferrisight'} · {HOW[e.how]}
            {e.value !== null && <> · {valueText(alarm, e.value, e.limit)}</>}
          </div>
          {e.comment && <p className="mt-0.5 whitespace-pre-wrap">{e.comment}</p>}
        </li>
      ))}
    </ol>
  );
}
