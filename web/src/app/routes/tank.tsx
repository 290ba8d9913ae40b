import { useParams } from 'react-router-dom';
import { ErrorState } from '../../components/ui/page-state';
import { TankView } from '../../features/tanks/components/tank-view';
import { SCREENS } from '../screens';

export function TankRoute() {
  const id = Number(useParams().id);
  if (!Number.isInteger(id) || id <= 0) return <ErrorState title="No such tank" detail="The address does not name a tank." />;
  // Keyed by id: moving between tanks starts clean (zoom, cursor, placeholder data).
  return (
    <TankView key={id} tankId={id} alarmsHref={`${SCREENS.alarms.path}?tank=${id}`} definitionsHref={`${SCREENS.alarms.path}?view=definitions&tank=${id}`} />
  );
}
