import { AlarmHandlingPanel } from '../../features/admin/components/alarm-handling-panel';
import { IngestHealthPanel } from '../../features/admin/components/ingest-health-panel';
import { SimulatorPanel } from '../../features/admin/components/simulator-panel';
import { UsersPanel } from '../../features/admin/components/users-panel';
import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { usePlant } from '../../features/floor/api/get-plant';
import { CaughtMailPanel } from '../../features/roster/components/caught-mail-panel';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

function PlantSetup() {
  const user = useSessionUser();
  const plant = usePlant();
  const probes =
    plant.data?.sites.flatMap((s) =>
      s.circuits.flatMap((c) => c.tanks.flatMap((t) => (t.probe ? [{ tag: t.probe.tag, label: `${t.probe.tag} (tank ${t.tag})` }] : []))),
    ) ?? [];

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Plant setup</h1>
      <UsersPanel currentUserId={user?.id ?? -1} />
      <AlarmHandlingPanel />
      <div className="grid gap-4 lg:grid-cols-2">
        <SimulatorPanel probes={probes} />
        <IngestHealthPanel timeZone={plant.data?.sites[0]?.timeZone ?? 'UTC'} />
      </div>
      <CaughtMailPanel timeZone={plant.data?.sites[0]?.timeZone ?? 'UTC'} />
    </div>
  );
}

export function PlantSetupRoute() {
  return (
    <RoleGate roles={SCREENS.setup.roles}>
      <PlantSetup />
    </RoleGate>
  );
}
