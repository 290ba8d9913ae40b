import { Link } from 'react-router-dom';
import type { SiteSummary } from '@shared/schemas/plant';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { formatRatio } from '../../../lib/format';
import { useTankAlarms } from '../../../lib/tank-alarms';
import type { TankStatus } from './tank-status';
import { tileLook, worstFirst } from './tile-look';

type SiteRow = { site: SiteSummary; tanks: { tank: SiteSummary['circuits'][number]['tanks'][number]; status: TankStatus }[] };

/**
 * Every site on one screen: per site its worst tank, how many tanks are in band and live, and
 * its sounding alarms by priority; each card leads into that site's Floor.
 */
export function SiteOverview({ sites }: { sites: SiteRow[] }) {
  const { badges, held } = useTankAlarms();
  return (
    <section aria-label="Sites" data-testid="site-overview">
      <h2 className="mb-2 text-lg font-bold">Sites</h2>
      <ul className="grid gap-3" style={{ gridTemplateColumns: 'repeat(auto-fill, minmax(17rem, 1fr))' }}>
        {sites.map(({ site, tanks }) => {
          const withAlarms = tanks.map((t) => ({ ...t, alarm: badges.get(t.tank.id) }));
          const inBand = tanks.filter((t) => t.status.kind === 'live' && t.status.position === 'in').length;
          const notLive = tanks.filter((t) => t.status.kind === 'stale' || t.status.kind === 'no-reading').length;
          const byPriority = [1, 2, 3].map((p) => withAlarms.filter((t) => t.alarm?.priority === p).length);
          const worst = [...withAlarms].sort(worstFirst)[0];
          const worstOut = worst && (worst.alarm || worst.status.decadesOut > 0 || worst.status.kind === 'stale') ? worst : undefined;
          const { frame } = worstOut ? tileLook(worstOut.status, worstOut.alarm, held.get(worstOut.tank.id)) : { frame: 'border border-line' };
          return (
            <li key={site.id}>
              <Link
                to={`/sites/${encodeURIComponent(site.tag)}`}
                data-testid="site-card"
                data-site={site.tag}
                className={`flex h-full flex-col gap-2 rounded-lg bg-panel p-3 hover:bg-panel-2 ${frame}`}
              >
                <div className="flex items-baseline justify-between gap-2">
                  <span className="text-xl font-bold">{site.name}</span>
                  <span className="text-xs uppercase tracking-wide text-ink-muted">{site.tag}</span>
                </div>
                <div className="flex items-baseline gap-4">
                  <div>
                    <div className="text-xs text-ink-muted">In band</div>
                    <div className="text-2xl font-bold tabular-nums" data-testid="site-in-band">
                      {inBand}
                      <span className="text-base font-normal text-ink-muted"> / {tanks.length}</span>
                    </div>
                  </div>
                  <div>
                    <div className="text-xs text-ink-muted">Sounding alarms</div>
                    <div className="flex items-center gap-2" data-testid="site-alarms">
                      {byPriority.every((n) => n === 0) ? (
                        <span className="text-ink-muted">None</span>
                      ) : (
                        byPriority.map((n, i) =>
                          n > 0 ? (
                            <span key={i} className="flex items-center gap-1 tabular-nums">
                              <PriorityPill priority={(i + 1) as 1 | 2 | 3} /> {n}
                            </span>
                          ) : null,
                        )
                      )}
                    </div>
                  </div>
                </div>
                <div className="text-sm">
                  <span className="text-ink-muted">Worst tank: </span>
                  {worstOut ? (
                    <span className="font-semibold">
                      {worstOut.tank.tag}
                      {worstOut.status.kind === 'stale'
                        ? ', not live'
                        : worstOut.status.position && worstOut.status.position !== 'in'
                          ? `, ${worstOut.status.position} band at ${formatRatio(worstOut.tank.latest?.ratio)}`
                          : ''}
                    </span>
                  ) : (
                    <span className="text-ink-muted">none out of band</span>
                  )}
                </div>
                {notLive > 0 && <div className="text-sm text-offline-ink">{notLive} not live</div>}
              </Link>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
