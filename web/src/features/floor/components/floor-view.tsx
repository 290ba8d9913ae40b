import { LiveStatusNotice } from '../../../components/ui/live-status-notice';
import { Notice } from '../../../components/ui/notice';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useNow } from '../../../lib/clock';
import { useMediaQuery } from '../../../lib/use-media-query';
import { usePlant } from '../api/get-plant';
import { useProbeFreshness } from '../hooks/use-probe-freshness';
import { CircuitRow } from './circuit-row';
import { TankStack } from './tank-stack';
import { tankStatus } from './tank-status';

const byPosition = <T extends { position: number }>(a: T, b: T) => a.position - b.position;

/** Every circuit of every site in train order, sized to fit one screen. */
export function FloorView() {
  const plant = usePlant();
  const freshness = useProbeFreshness();
  const now = useNow();
  const wide = useMediaQuery('(min-width: 1024px)');

  if (plant.isPending) return <Loading label="Loading the plant…" />;
  // After a failed refresh the last values stay on screen (they go stale by age); only a first load can fail outright.
  if (!plant.data) return <ErrorState title="The plant could not be loaded" detail={plant.error?.message} onRetry={() => plant.refetch()} />;

  const multiSite = plant.data.sites.length > 1;
  const circuits = plant.data.sites.flatMap((site) =>
    [...site.circuits].sort(byPosition).map((c) => ({ site, circuit: { ...c, tanks: [...c.tanks].sort(byPosition) } })),
  );
  if (circuits.length === 0) {
    return <ErrorState title="No circuits yet" detail="An administrator adds sites, circuits and tanks in Plant setup." />;
  }
  const columns = Math.max(1, ...circuits.map(({ circuit }) => circuit.tanks.length));
  const rows = circuits.map(({ site, circuit }) => ({
    site,
    circuit,
    statuses: circuit.tanks.map((t) => tankStatus(t, now, t.probe ? freshness[t.probe.id] : undefined)),
  }));

  return (
    <div className="flex h-full flex-col gap-2">
      <h1 className="sr-only">Floor</h1>
      <LiveStatusNotice />
      {plant.isError && (
        <Notice tone="attention">
          <span className="font-semibold">Refresh failed:</span> {plant.error.message.replace(/\.$/, '')}. Showing the last values received; they turn stale as
          they age.
        </Notice>
      )}
      {wide ? (
        <div className="grid min-h-0 flex-1 gap-3 overflow-auto" style={{ gridTemplateRows: `repeat(${rows.length}, minmax(15rem, 1fr))` }}>
          {rows.map(({ site, circuit, statuses }) => (
            <CircuitRow key={circuit.id} circuit={circuit} columns={columns} siteName={multiSite ? site.name : undefined} nowMs={now} statuses={statuses} />
          ))}
        </div>
      ) : (
        <TankStack rows={rows} nowMs={now} />
      )}
    </div>
  );
}
