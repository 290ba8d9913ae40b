import type { ReactNode } from 'react';
import { Link } from 'react-router-dom';
import { PLANT_SHELVE_RULE } from '@shared/alarms/roles';
import type { Role } from '@shared/schemas/auth';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { Panel } from '../../../components/ui/panel';
import { formatDateTime, formatDuration } from '../../../lib/format';
import { useShelveRules } from '../api/get-shelve-rules';
import { useAlarm } from '../api/get-alarm';
import { AlarmActions } from './alarm-actions';
import { AlarmStateLabel } from './alarm-state-label';
import { isUnacknowledged, nowText, placeOf, valueText } from './alarm-states';
import type { Place } from './desk-types';
import { AlarmTimeline } from './alarm-timeline';

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[7rem_1fr] gap-2 text-sm sm:grid-cols-[9rem_1fr]">
      <dt className="text-ink-muted">{label}</dt>
      <dd>{children}</dd>
    </div>
  );
}

/** One alarm: facts, rationalisation (cause, consequence, what to do, time to respond), actions, timeline. */
export function AlarmDetail({ id, role, timeZone, places, onClose }: { id: number; role: Role; timeZone: string; places: Place[]; onClose: () => void }) {
  const q = useAlarm(id);
  const rules = useShelveRules();
  if (!q.data) return <Panel title="Alarm">{q.isError ? <p className="text-attention-1-ink">{q.error.message}</p> : <p className="text-ink-muted">Loading…</p>}</Panel>;
  const { alarm, timeline } = q.data;
  const when = (iso: string | null) => (iso ? formatDateTime(iso, timeZone) : '—');
  const live = alarm.closedAt || alarm.tankId === null ? null : nowText(alarm, places.find((p) => p.tankId === alarm.tankId)?.latest);
  return (
    <Panel
      title={`${placeOf(alarm)} · ${alarm.label}`}
      actions={<button type="button" onClick={onClose} className="text-sm text-ink-muted hover:text-ink">Close</button>}
    >
      <div className="flex flex-col gap-4" data-testid="alarm-detail" data-alarm-id={alarm.id}>
        <div className="flex items-center gap-3">
          <PriorityPill priority={alarm.priority} pulse={isUnacknowledged(alarm.state)} />
          <AlarmStateLabel state={alarm.state} shelvedUntil={alarm.shelvedUntil} timeZone={timeZone} />
          {alarm.tankId !== null && <Link to={`/tanks/${alarm.tankId}`} className="ml-auto text-sm text-info-ink underline">Tank page</Link>}
        </div>
        <dl className="flex flex-col gap-1">
          {live && <Fact label="Now">{live}</Fact>}
          <Fact label="At activation">{valueText(alarm, alarm.firstValue, alarm.limitValue)}</Fact>
          <Fact label="Active since">{when(alarm.activatedAt ?? alarm.openedAt)}</Fact>
          {alarm.ackedBy && <Fact label="Acknowledged">{`${alarm.ackedBy}, ${when(alarm.ackedAt)}`}</Fact>}
          {alarm.shelvedUntil && <Fact label="Shelved">{`until ${when(alarm.shelvedUntil)} by ${alarm.shelvedBy ?? '—'}: ${alarm.shelvedReason ?? ''}`}</Fact>}
          {alarm.oosReason && <Fact label="Out of service">{`${alarm.oosReason}${alarm.oosUntil ? `; until ${when(alarm.oosUntil)}` : ''}`}</Fact>}
          {alarm.closedAt && <Fact label="Back to normal">{when(alarm.closedAt)}</Fact>}
        </dl>
        <section aria-label="Rationalisation" className="rounded-md bg-panel-2 p-3">
          <h3 className="mb-1 text-sm font-bold">What to do · respond within {formatDuration(alarm.rationalisation.responseMin * 60)}</h3>
          <p className="text-sm">{alarm.rationalisation.action}</p>
          <dl className="mt-2 flex flex-col gap-1">
            <Fact label="Likely cause">{alarm.rationalisation.cause}</Fact>
            <Fact label="If nobody acts">{alarm.rationalisation.consequence}</Fact>
          </dl>
        </section>
        <AlarmActions alarm={alarm} role={role} shelveRule={alarm.siteTag === null ? PLANT_SHELVE_RULE : rules.data?.get(alarm.siteTag)} />
        <section aria-label="Timeline">
          <h3 className="mb-2 text-sm font-bold">Timeline</h3>
          <AlarmTimeline alarm={alarm} events={timeline} timeZone={timeZone} />
        </section>
      </div>
    </Panel>
  );
}
