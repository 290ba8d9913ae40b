import { Loading } from '../../components/ui/page-state';
import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { BandsView } from '../../features/bands/components/bands-view';
import { usePlant } from '../../features/floor/api/get-plant';
import { plantKeys } from '../../features/floor/api/plant-keys';
import { queryClient } from '../../lib/query-client';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

// A band change shows on the Floor and tank pages at once, not after the plant tree goes stale.
const refreshPlant = () => void queryClient.invalidateQueries({ queryKey: plantKeys.all });

export function BandsRoute() {
  const user = useSessionUser();
  const timeZone = usePlant().data?.sites[0]?.timeZone;
  if (!user || !timeZone) return <Loading />;
  return (
    <RoleGate roles={SCREENS.bands.roles}>
      <BandsView user={user} timeZone={timeZone} onBandChanged={refreshPlant} />
    </RoleGate>
  );
}
