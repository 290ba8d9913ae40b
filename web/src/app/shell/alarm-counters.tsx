import { AlarmHeaderCounters } from '../../features/alarms/components/alarm-header-counters';
import { OnCallNow } from '../../features/roster/components/on-call-now';
import { SCREENS } from '../screens';

/** Live counts by priority (click → Alarm desk), the alarm sound switch, and who is on call now. */
export function AlarmCounters() {
  return (
    <div className="flex items-center gap-3">
      <AlarmHeaderCounters deskPath={SCREENS.alarms.path} />
      <OnCallNow compact rosterPath={SCREENS.roster.path} />
    </div>
  );
}
