import { PRIORITY_LABEL, type Priority } from '@shared/alarms/kinds';
import { ON_CALL_LABEL } from '@shared/schemas/roster';
import { Panel } from '../../../components/ui/panel';
import { usePolicy } from '../api/get-policy';

/** Escalation steps per priority: after how long unacknowledged, who gets an e-mail. Steps stop at acknowledgement. */
export function PolicyView() {
  const q = usePolicy();
  const steps = q.data ?? [];
  return (
    <Panel title="Escalation policy">
      <ul className="flex flex-col gap-2 text-sm" data-testid="policy">
        {([1, 2, 3] as Priority[]).map((p) => {
          const mine = steps.filter((s) => s.priority === p);
          return (
            <li key={p}>
              <span className="font-semibold">{PRIORITY_LABEL[p]}:</span>{' '}
              {mine.length === 0 ? <span className="text-ink-muted">no e-mail</span> : mine.map((s) => `after ${s.afterMin} min → ${s.notify.map((r) => ON_CALL_LABEL[r]).join(' and ')}`).join('; then ')}
            </li>
          );
        })}
      </ul>
      <p className="mt-3 text-sm text-ink-muted">Escalation e-mail stops once the alarm is acknowledged, on screen or from the link in the mail.</p>
    </Panel>
  );
}
