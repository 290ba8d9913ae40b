import type { CircuitSummary, SiteSummary } from '@shared/schemas/plant';
import { useTankAlarms } from '../../../lib/tank-alarms';
import { CompactTile } from './compact-tile';
import type { TankStatus } from './tank-status';
import { worstFirst } from './tile-look';

type Row = { site: SiteSummary; circuit: CircuitSummary; statuses: TankStatus[] };

/** How many of the worst tanks lead the page. */
const ATTENTION_MAX = 16;

const needsAttention = (x: { status: TankStatus; alarm?: unknown }) =>
  x.alarm !== undefined || x.status.kind === 'stale' || (x.status.kind === 'live' && x.status.position !== 'in');

/**
 * The Floor of a large plant: the tanks that need attention lead the page, worst first; then
 * every circuit in train order with its tanks as small tiles in flow order. Circuits off screen
 * are skipped by the browser's layout and paint (content-visibility) until scrolled to.
 */
export function DenseFloor({ rows, multiSite }: { rows: Row[]; multiSite: boolean }) {
  const { badges, held } = useTankAlarms();
  const all = rows.flatMap(({ site, circuit, statuses }) =>
    circuit.tanks.map((tank, i) => ({ site, circuit, tank, status: statuses[i], alarm: badges.get(tank.id) })),
  );
  const attention = all.filter(needsAttention).sort(worstFirst);

  return (
    <div className="flex min-h-0 flex-1 flex-col gap-3 overflow-auto pr-1" data-testid="dense-floor">
      <section aria-label="Tanks that need attention, worst first" className="rounded-lg border border-line bg-panel-2 p-3">
        <h2 className="mb-2 flex items-baseline gap-2 text-lg font-bold">
          Needs attention
          <span className="text-sm font-normal text-ink-muted">
            {attention.length === 0 ? `all ${all.length} tanks in band and live` : `${attention.length} of ${all.length} tanks, worst first`}
          </span>
        </h2>
        {attention.length > 0 && (
          <ul className="grid gap-2" style={{ gridTemplateColumns: 'repeat(auto-fill, minmax(10.5rem, 1fr))' }}>
            {attention.slice(0, ATTENTION_MAX).map(({ tank, circuit, site, status, alarm }) => (
              <li key={tank.id} className="min-w-0">
                <div className="mb-0.5 truncate text-xs text-ink-muted">
                  {multiSite ? `${site.name} · ` : ''}
                  {circuit.name}
                </div>
                <div className="h-16">
                  <CompactTile tank={tank} status={status} alarm={alarm} held={held.get(tank.id)} />
                </div>
              </li>
            ))}
          </ul>
        )}
        {attention.length > ATTENTION_MAX && <p className="mt-2 text-sm text-ink-muted">{attention.length - ATTENTION_MAX} more below, marked in their circuits.</p>}
      </section>

      {rows.map(({ site, circuit, statuses }) => {
        const inBand = statuses.filter((s) => s.kind === 'live' && s.position === 'in').length;
        return (
          <section
            key={circuit.id}
            aria-label={`${multiSite ? `${site.name}, ` : ''}${circuit.name}, tanks in flow order`}
            className="rounded-lg border border-line p-3 [content-visibility:auto] [contain-intrinsic-size:auto_14rem]"
            data-testid="dense-circuit"
          >
            <h2 className="mb-2 flex flex-wrap items-baseline gap-x-3 text-lg font-bold">
              {multiSite && <span className="text-sm font-normal text-ink-muted">{site.name}</span>}
              {circuit.name}
              <span className="text-sm font-normal tabular-nums text-ink-muted">
                {inBand} / {circuit.tanks.length} in band
              </span>
            </h2>
            <ul className="grid gap-2" style={{ gridTemplateColumns: 'repeat(auto-fill, minmax(8.75rem, 1fr))' }}>
              {circuit.tanks.map((tank, i) => (
                <li key={tank.id} className="h-16 min-w-0">
                  <CompactTile tank={tank} status={statuses[i]} alarm={badges.get(tank.id)} held={held.get(tank.id)} />
                </li>
              ))}
            </ul>
          </section>
        );
      })}
    </div>
  );
}
