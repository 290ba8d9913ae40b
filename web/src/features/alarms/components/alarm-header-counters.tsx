import { PriorityCount } from '../../../components/ui/priority-pill';
import { useActiveAlarms } from '../api/get-active-alarms';
import { isAnnunciated, isUnacknowledged } from './alarm-states';
import { SoundToggle } from './sound-toggle';

/** Header counters: annunciated alarms per priority, live; a priority with alarms waiting for acknowledgement pulses. */
export function AlarmHeaderCounters({ deskPath }: { deskPath: string }) {
  const alarms = useActiveAlarms().data?.alarms ?? [];
  const count = (p: 1 | 2 | 3) => alarms.filter((a) => a.priority === p && isAnnunciated(a.state)).length;
  const unacknowledged = (p: 1 | 2 | 3) => alarms.filter((a) => a.priority === p && isUnacknowledged(a.state)).length;
  const waiting = (p: 1 | 2 | 3) => unacknowledged(p) > 0;
  return (
    <div className="flex items-center gap-1.5">
      <nav aria-label="Alarms by priority" className="flex items-center gap-1.5" data-testid="alarm-counters">
        {([1, 2, 3] as const).map((p) => (
          <span key={p} className={waiting(p) ? 'pulse-attention rounded-full' : ''} data-priority={p} data-count={count(p)} data-waiting={waiting(p) ? 'true' : 'false'} data-unack={unacknowledged(p)}>
            <PriorityCount priority={p} count={count(p)} to={deskPath} />
          </span>
        ))}
      </nav>
      <SoundToggle />
    </div>
  );
}
