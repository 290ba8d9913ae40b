import { Link } from 'react-router-dom';
import { ACK_ROLES } from '@shared/alarms/roles';
import type { Role } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { useNow } from '../../../lib/clock';
import { formatDuration } from '../../../lib/format';
import { useAcknowledgeAlarm } from '../api/acknowledge-alarm';
import { useActiveAlarms } from '../api/get-active-alarms';
import { isAnnunciated, isUnacknowledged, STATE_LABEL } from './alarm-states';

type Props = { role: Role; deskPath: string; /** Plant setup's health panel, for those who may open it. */ healthPath?: string };

/**
 * A plant-wide alarm (Ferrisight itself, e.g. ingest stopped) stays in view on every screen, the
 * Floor included, until it is back to normal and acknowledged: every tank value may be old
 * while it lasts. It cannot be dismissed, only acknowledged.
 */
export function PlantAlarmBanner({ role, deskPath, healthPath }: Props) {
  const alarms = useActiveAlarms().data?.alarms.filter((a) => a.tankId === null && isAnnunciated(a.state)) ?? [];
  const ack = useAcknowledgeAlarm();
  const now = useNow();
  if (alarms.length === 0) return null;
  return (
    <div role="alert" className="flex flex-col gap-2 border-b-2 border-attention-1 bg-attention-1-soft px-3 py-2" data-testid="plant-alarm-banner">
      {alarms.map((a) => (
        <div key={a.id} className="flex flex-wrap items-center gap-x-3 gap-y-1" data-alarm-id={a.id} data-state={a.state}>
          <PriorityPill priority={a.priority} pulse={isUnacknowledged(a.state)} />
          <span className="min-w-0 font-bold text-attention-1-ink">{a.label}</span>
          <span className="text-sm">
            {a.conditionActive ? `for ${formatDuration((now - Date.parse(a.activatedAt ?? a.openedAt)) / 1000)}; tank values and tank alarms may be out of date` : 'readings are being stored again'}
            {' · '}{STATE_LABEL[a.state]}
          </span>
          <span className="ml-auto flex flex-wrap items-center gap-3">
            {healthPath && <Link to={healthPath} className="text-sm font-semibold text-info-ink underline">Ingest health</Link>}
            <Link to={`${deskPath}?alarm=${a.id}`} className="text-sm font-semibold text-info-ink underline">Alarm desk</Link>
            {ACK_ROLES.includes(role) && isUnacknowledged(a.state) && (
              <Button size="sm" variant="primary" disabled={ack.isPending} onClick={() => ack.mutate({ id: a.id })} aria-label={`Acknowledge ${a.label}`}>
                Acknowledge
              </Button>
            )}
          </span>
        </div>
      ))}
    </div>
  );
}
