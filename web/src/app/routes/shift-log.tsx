import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { usePlant } from '../../features/floor/api/get-plant';
import { ShiftLogView } from '../../features/shift-log/components/shift-log-view';
import { Loading } from '../../components/ui/page-state';

/** The app layer hands the plant's tanks to the shift log (features do not import each other). */
export function ShiftLogRoute() {
  const user = useSessionUser();
  const plant = usePlant();
  if (!user) return <Loading />;
  const tanks = plant.data?.sites.flatMap((s) => s.circuits.flatMap((c) => c.tanks.map((t) => ({ id: t.id, tag: t.tag })))) ?? [];
  return <ShiftLogView tanks={tanks} user={user} />;
}
