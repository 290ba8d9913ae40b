import { useEffect } from 'react';
import { Link } from 'react-router-dom';
import { LiveStatusNotice } from '../../../components/ui/live-status-notice';
import { Notice } from '../../../components/ui/notice';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useNow } from '../../../lib/clock';
import { watchLiveSites } from '../../../lib/socket';
import { useMediaQuery } from '../../../lib/use-media-query';
import { usePlant } from '../api/get-plant';
import { useProbeFreshness } from '../hooks/use-probe-freshness';
import { CircuitRow } from './circuit-row';
import { DenseFloor } from './dense-floor';
import { SiteOverview } from './site-overview';
import { TankStack } from './tank-stack';
import { tankStatus } from './tank-status';

const byPosition = <T extends { position: number }>(a: T, b: T) => a.position - b.position;

/** Above this many tanks on one screen the tiles turn small and the worst tanks lead the page. */
const DENSE_FROM = 40;

/**
 * The Floor. One site: every circuit in train order, sized to fit one screen (small tiles and the
 * worst tanks first when the site is large). Several sites: the site overview, each card leading
 * to that site's Floor (`siteTag`).
 */
export function FloorView({ siteTag }: { siteTag?: string }) {
  const plant = usePlant();
  const freshness = useProbeFreshness();
  const now = useNow();
  const wide = useMediaQuery('(min-width: 1024px)');

  // A site's Floor needs only that site's live values; every other screen keeps them all.
  useEffect(() => {
    if (!siteTag) return;
    watchLiveSites([siteTag]);
    return () => watchLiveSites('all');
  }, [siteTag]);

  if (plant.isPending) return <Loading label="Loading the plant…" />;
  // After a failed refresh the last values stay on screen (they go stale by age); only a first load can fail outright.
  if (!plant.data) return <ErrorState title="The plant could not be loaded" detail={plant.error?.message} onRetry={() => plant.refetch()} />;

  const allSites = plant.data.sites;
  const sites = siteTag ? allSites.filter((s) => s.tag === siteTag) : allSites;
  if (siteTag && sites.length === 0) return <ErrorState title={`No site ${siteTag}`} detail="It may have been renamed or retired in Plant setup." />;
  const status = (t: (typeof allSites)[number]['circuits'][number]['tanks'][number]) => tankStatus(t, now, t.probe ? freshness[t.probe.id] : undefined);

  const notices = (
    <>
      <LiveStatusNotice />
      {plant.isError && (
        <Notice tone="attention">
          <span className="font-semibold">Refresh failed:</span> {plant.error.message.replace(/\.$/, '')}. Showing the last values received; they turn stale as
          they age.
        </Notice>
      )}
    </>
  );

  if (!siteTag && sites.length > 1) {
    const overview = sites.map((site) => ({ site, tanks: site.circuits.flatMap((c) => c.tanks.map((tank) => ({ tank, status: status(tank) }))) }));
    return (
      <div className="flex h-full flex-col gap-2 overflow-auto">
        <h1 className="sr-only">Floor: site overview</h1>
        {notices}
        <SiteOverview sites={overview} />
      </div>
    );
  }

  const multiSite = sites.length > 1;
  const rows = sites.flatMap((site) =>
    [...site.circuits].sort(byPosition).map((c) => {
      const circuit = { ...c, tanks: [...c.tanks].sort(byPosition) };
      return { site, circuit, statuses: circuit.tanks.map(status) };
    }),
  );
  if (rows.length === 0) {
    return <ErrorState title="No circuits yet" detail="An administrator adds sites, circuits and tanks in Plant setup." />;
  }
  const tankCount = rows.reduce((n, r) => n + r.circuit.tanks.length, 0);
  const columns = Math.max(1, ...rows.map(({ circuit }) => circuit.tanks.length));

  return (
    <div className="flex h-full flex-col gap-2">
      <h1 className="sr-only">Floor{siteTag ? `: ${sites[0].name}` : ''}</h1>
      {siteTag && allSites.length > 1 && (
        <nav aria-label="Sites" className="flex items-baseline gap-3 text-sm">
          <Link to="/" className="text-info underline-offset-2 hover:underline">
            ← All sites
          </Link>
          <span className="font-semibold">{sites[0].name}</span>
        </nav>
      )}
      {notices}
      {!wide ? (
        <TankStack rows={rows} nowMs={now} />
      ) : tankCount > DENSE_FROM ? (
        <DenseFloor rows={rows} multiSite={multiSite} />
      ) : (
        <div className="grid min-h-0 flex-1 gap-3 overflow-auto" style={{ gridTemplateRows: `repeat(${rows.length}, minmax(15rem, 1fr))` }}>
          {rows.map(({ site, circuit, statuses }) => (
            <CircuitRow key={circuit.id} circuit={circuit} columns={columns} siteName={multiSite ? site.name : undefined} nowMs={now} statuses={statuses} />
          ))}
        </div>
      )}
    </div>
  );
}
