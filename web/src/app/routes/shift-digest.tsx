import { DigestView } from '../../features/digest/components/digest-view';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

export function ShiftDigestRoute() {
  return (
    <RoleGate roles={SCREENS.digest.roles}>
      <DigestView />
    </RoleGate>
  );
}
