import { Loading } from '../../components/ui/page-state';
import { AssaysView } from '../../features/assays/components/assays-view';
import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { usePlant } from '../../features/floor/api/get-plant';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

export function AssaysRoute() {
  const user = useSessionUser();
  const plant = usePlant();
  const site = plant.data?.sites[0];
  if (!user || !site) return <Loading />;
  const tanks = site.circuits.flatMap((c) => c.tanks.map((t) => ({ id: t.id, tag: t.tag, name: t.name, circuitTag: c.tag })));
  return (
    <RoleGate roles={SCREENS.assays.roles}>
      <AssaysView user={user} tanks={tanks} timeZone={site.timeZone} />
    </RoleGate>
  );
}
