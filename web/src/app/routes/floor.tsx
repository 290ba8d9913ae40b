import { FloorView } from '../../features/floor/components/floor-view';

export function FloorRoute() {
  return <FloorView />;
}
