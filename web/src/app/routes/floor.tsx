import { useParams } from 'react-router-dom';
import { FloorView } from '../../features/floor/components/floor-view';

/** `/` (one site's Floor, or the site overview when there are several) and `/sites/:tag` (one site's Floor). */
export function FloorRoute() {
  const { tag } = useParams();
  return <FloorView siteTag={tag} />;
}
