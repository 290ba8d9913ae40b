import { AlarmDesk } from '../../features/alarms/components/alarm-desk';
import type { Place } from '../../features/alarms/components/desk-types';
import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { usePlant } from '../../features/floor/api/get-plant';
import { OnCallNow } from '../../features/roster/components/on-call-now';
import { Loading } from '../../components/ui/page-state';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

/** Composes the Alarm desk with what other features know: the plant (places, time zone) and who is on call. */
function Desk() {
  const user = useSessionUser();
  const plant = usePlant();
  if (!user || !plant.data) return <Loading label="Loading the Alarm desk…" />;
  const sites = plant.data.sites;
  const places: Place[] = sites.flatMap((s) =>
    s.circuits.flatMap((c) => c.tanks.map((t) => ({ siteTag: s.tag, siteName: s.name, circuitId: c.id, circuitName: c.name, tankId: t.id, tankTag: t.tag, latest: t.latest }))),
  );
  return <AlarmDesk role={user.role} timeZone={sites[0]?.timeZone ?? 'UTC'} places={places} aside={<OnCallNow />} />;
}

export function AlarmDeskRoute() {
  return (
    <RoleGate roles={SCREENS.alarms.roles}>
      <Desk />
    </RoleGate>
  );
}
