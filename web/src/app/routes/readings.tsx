import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { ReadingsView } from '../../features/digest/components/readings-view';
import { usePlant } from '../../features/floor/api/get-plant';
import { Loading } from '../../components/ui/page-state';

export function ReadingsRoute() {
  const user = useSessionUser();
  const plant = usePlant();
  const site = plant.data?.sites[0];
  if (!user || !site) return <Loading />;
  const tanks = site.circuits.flatMap((c) => c.tanks.map((t) => ({ id: t.id, tag: t.tag, circuitTag: c.tag })));
  return <ReadingsView tanks={tanks} timeZone={site.timeZone} user={user} />;
}
