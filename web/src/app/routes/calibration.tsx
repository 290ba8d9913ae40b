import { Loading } from '../../components/ui/page-state';
import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { CalibrationView } from '../../features/calibration/components/calibration-view';
import { usePlant } from '../../features/floor/api/get-plant';
import { plantKeys } from '../../features/floor/api/plant-keys';
import { queryClient } from '../../lib/query-client';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

// The tank facts show the calibration version in force: refresh them once a new one is applied.
const refreshPlant = () => void queryClient.invalidateQueries({ queryKey: plantKeys.all });

export function CalibrationRoute() {
  const user = useSessionUser();
  const plant = usePlant();
  const site = plant.data?.sites[0];
  if (!user || !site) return <Loading />;
  const tanks = site.circuits.flatMap((c) => c.tanks.map((t) => ({ id: t.id, tag: t.tag, name: t.name })));
  return (
    <RoleGate roles={SCREENS.calibration.roles}>
      <CalibrationView user={user} tanks={tanks} timeZone={site.timeZone} onCalibrationChanged={refreshPlant} />
    </RoleGate>
  );
}
