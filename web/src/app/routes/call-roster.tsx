import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { usePlant } from '../../features/floor/api/get-plant';
import { CallRoster } from '../../features/roster/components/call-roster';
import { Loading } from '../../components/ui/page-state';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

export function CallRosterRoute() {
  const user = useSessionUser();
  const plant = usePlant();
  return (
    <RoleGate roles={SCREENS.roster.roles}>
      {user ? <CallRoster role={user.role} timeZone={plant.data?.sites[0]?.timeZone ?? 'UTC'} /> : <Loading />}
    </RoleGate>
  );
}
