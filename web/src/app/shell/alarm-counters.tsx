import { PriorityCount } from '../../components/ui/priority-pill';
import { SCREENS } from '../screens';

/** Counts by priority. Zeros until the Alarm desk lands; the place and shapes are final. */
export function AlarmCounters() {
  return (
    <nav aria-label="Alarms by priority" className="flex items-center gap-1.5">
      <PriorityCount priority={1} count={0} to={SCREENS.alarms.path} />
      <PriorityCount priority={2} count={0} to={SCREENS.alarms.path} />
      <PriorityCount priority={3} count={0} to={SCREENS.alarms.path} />
    </nav>
  );
}
