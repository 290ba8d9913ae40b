import { Link } from 'react-router-dom';
import { LiveStatusNotice } from '../../../components/ui/live-status-notice';
import { Notice } from '../../../components/ui/notice';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useNow } from '../../../lib/clock';
import { freshnessOf } from '../../../lib/freshness';
import { useTank } from '../api/get-tank';
import { useTankAssays } from '../api/get-tank-assays';
import { rangeKey, useTrend } from '../api/get-trend';
import { useTankLive } from '../hooks/use-tank-live';
import { useTrendRange } from '../hooks/use-trend-range';
import { RangePicker } from './range-picker';
import { RecentReadings } from './recent-readings';
import { TankFacts } from './tank-facts';
import { TrendCharts } from './trend-charts';

/** Trends on the left two thirds, facts on the right third; stacked, charts full width, on narrow screens. */
export function TankView({ tankId, alarmsHref, definitionsHref }: { tankId: number; alarmsHref?: string; definitionsHref?: string }) {
  const detail = useTank(tankId);
  const [range, setRange] = useTrendRange();
  const trend = useTrend(tankId, range);
  const assays = useTankAssays(tankId, range);
  const serverFreshness = useTankLive(tankId);
  const now = useNow();

  if (detail.isPending) return <Loading label="Loading the tank…" />;
  if (!detail.data) {
    const missing = detail.error?.status === 404;
    return (
      <ErrorState
        title={missing ? 'No such tank' : 'The tank could not be loaded'}
        detail={missing ? 'It may have been removed or renumbered.' : detail.error?.message}
        onRetry={missing ? undefined : () => detail.refetch()}
      >
        <Link to="/" className="mt-3 inline-block text-info-ink underline">
          Back to the Floor
        </Link>
      </ErrorState>
    );
  }

  const { tank, site, circuit } = detail.data;
  const freshness = tank.probe
    ? freshnessOf(tank.latest?.ts, tank.probe.intervalS, now, serverFreshness?.probeId === tank.probe.id ? serverFreshness : undefined)
    : { ageS: null, stale: true };

  return (
    <div className="grid min-h-0 grid-cols-1 gap-4 lg:h-full lg:grid-cols-3">
      <div className="flex min-h-0 min-w-0 flex-col gap-3 lg:col-span-2">
        <div className="flex flex-wrap items-baseline gap-x-4 gap-y-1">
          <Link to="/" className="text-sm text-info-ink underline-offset-2 hover:underline">
            ← Floor
          </Link>
          <h1 className="text-3xl font-bold leading-none">{tank.tag}</h1>
          <span className="text-lg">{tank.name}</span>
          <span className="text-ink-muted">
            {circuit.name} · position {tank.position} · {site.name}
          </span>
        </div>
        <LiveStatusNotice />
        <RangePicker key={`picker-${rangeKey(range)}`} range={range} timeZone={site.timeZone} onChange={setRange} staleForS={freshness.stale ? freshness.ageS : undefined} />
        {(detail.isError || (trend.isError && trend.data)) && (
          <Notice tone="attention">
            <span className="font-semibold">Refresh failed:</span> {(detail.error ?? trend.error)?.message.replace(/\.$/, '')}. Showing the last
            values received.
          </Notice>
        )}
        {!trend.data && trend.isError ? (
          <ErrorState title="The trend could not be loaded" detail={trend.error.message} onRetry={() => trend.refetch()} />
        ) : trend.data ? (
          <TrendCharts
            key={`charts-${rangeKey(range)}`}
            tankId={tank.id}
            trend={trend.data}
            band={tank.band}
            probe={tank.probe}
            timeZone={site.timeZone}
            assays={assays.data}
          />
        ) : (
          <Loading label="Loading the trend…" />
        )}
      </div>
      <aside aria-label="Facts" className="min-h-0 min-w-0 rounded-lg border border-line bg-panel p-4 lg:overflow-auto">
        <TankFacts tank={tank} timeZone={site.timeZone} freshness={freshness} alarmsHref={alarmsHref} definitionsHref={definitionsHref} />
        <RecentReadings readings={detail.data.recent ?? []} timeZone={site.timeZone} />
      </aside>
    </div>
  );
}
