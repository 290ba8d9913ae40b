import { Loading } from '../../components/ui/page-state';
import { DoseView } from '../../features/dose/components/dose-view';
import { usePlant } from '../../features/floor/api/get-plant';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

export function DoseAdvisorRoute() {
  const plant = usePlant();
  const site = plant.data?.sites[0];
  if (!site) return <Loading />;
  const tanks = site.circuits.flatMap((c) => c.tanks.map((t) => ({ id: t.id, tag: t.tag, name: t.name })));
  return (
    <RoleGate roles={SCREENS.dose.roles}>
      <DoseView tanks={tanks} timeZone={site.timeZone} />
    </RoleGate>
  );
}
