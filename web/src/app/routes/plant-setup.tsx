import { useEffect } from 'react';
import { Link, useLocation, useSearchParams } from 'react-router-dom';
import { AlarmHandlingPanel } from '../../features/admin/components/alarm-handling-panel';
import { AuditTrailPanel } from '../../features/admin/components/audit-trail-panel';
import { IngestHealthPanel } from '../../features/admin/components/ingest-health-panel';
import { SimulatorPanel } from '../../features/admin/components/simulator-panel';
import { UsersPanel } from '../../features/admin/components/users-panel';
import { useSessionUser } from '../../features/auth/hooks/use-session-user';
import { usePlant } from '../../features/floor/api/get-plant';
import { DeadLettersPanel } from '../../features/plant-setup/components/dead-letters-panel';
import { PlantParts } from '../../features/plant-setup/components/plant-parts';
import { CaughtMailPanel } from '../../features/roster/components/caught-mail-panel';
import { SparkplugPanel, type SparkplugSiteOption } from '../../features/sparkplug/components/sparkplug-panel';
import { SCREENS } from '../screens';
import { RoleGate } from './role-gate';

const TABS = [
  { id: 'plant', label: 'Plant', admin: false },
  { id: 'dead-letters', label: 'Dead letters and conflicts', admin: false },
  { id: 'sparkplug', label: 'Sparkplug B edge nodes', admin: true },
  { id: 'people', label: 'People and services', admin: true },
  { id: 'audit', label: 'Audit trail', admin: true },
] as const;

function SparkplugSection() {
  const plant = usePlant();
  if (!plant.data) return null;
  const sites: SparkplugSiteOption[] = plant.data.sites.map((s) => ({
    id: s.id,
    tag: s.tag,
    probes: s.circuits.flatMap((c) => c.tanks.flatMap((t) => (t.probe ? [{ id: t.probe.id, label: `${t.probe.tag} (tank ${t.tag})` }] : []))),
  }));
  return <SparkplugPanel sites={sites} timeZone={plant.data.sites[0]?.timeZone ?? 'UTC'} />;
}

function PeopleAndServices({ userId }: { userId: number }) {
  const plant = usePlant();
  const probes =
    plant.data?.sites.flatMap((s) =>
      s.circuits.flatMap((c) => c.tanks.flatMap((t) => (t.probe ? [{ tag: t.probe.tag, label: `${t.probe.tag} (tank ${t.tag})` }] : []))),
    ) ?? [];
  const timeZone = plant.data?.sites[0]?.timeZone ?? 'UTC';
  // The system alarm's banner links to #ingest-health: a client-side navigation does not scroll to it by itself.
  const { hash } = useLocation();
  useEffect(() => {
    if (hash) document.getElementById(hash.slice(1))?.scrollIntoView({ block: 'start' });
  }, [hash]);
  return (
    <div className="flex flex-col gap-4">
      <UsersPanel currentUserId={userId} />
      <AlarmHandlingPanel />
      <div className="grid gap-4 lg:grid-cols-2">
        <SimulatorPanel probes={probes} />
        <div id="ingest-health"><IngestHealthPanel timeZone={timeZone} deskPath={SCREENS.alarms.path} /></div>
      </div>
      <CaughtMailPanel timeZone={timeZone} />
    </div>
  );
}

function PlantSetup() {
  const user = useSessionUser();
  const plant = usePlant();
  const [params] = useSearchParams();
  const isAdmin = user?.role === 'admin';
  const tabs = TABS.filter((t) => isAdmin || !t.admin);
  const tab = tabs.find((t) => t.id === params.get('tab'))?.id ?? 'plant';

  return (
    <div className="mx-auto flex max-w-6xl flex-col gap-4">
      <h1 className="text-2xl font-bold">Plant setup</h1>
      <nav aria-label="Plant setup sections" className="flex gap-2 border-b border-line">
        {tabs.map((t) => (
          <Link key={t.id} to={`?tab=${t.id}`} aria-current={t.id === tab ? 'page' : undefined}
            className={`-mb-px border-b-2 px-3 py-2 text-sm font-semibold ${t.id === tab ? 'border-ink' : 'border-transparent text-ink-muted'}`}>
            {t.label}
          </Link>
        ))}
      </nav>
      {tab === 'plant' && <PlantParts canEditStructure={isAdmin} canEditField={isAdmin || user?.role === 'engineer'} />}
      {tab === 'dead-letters' && <DeadLettersPanel siteTags={plant.data?.sites.map((s) => s.tag) ?? []} />}
      {tab === 'sparkplug' && isAdmin && <SparkplugSection />}
      {tab === 'people' && isAdmin && <PeopleAndServices userId={user?.id ?? -1} />}
      {tab === 'audit' && isAdmin && <AuditTrailPanel timeZone={plant.data?.sites[0]?.timeZone ?? 'UTC'} />}
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
