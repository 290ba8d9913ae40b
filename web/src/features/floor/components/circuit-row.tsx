import type { CircuitSummary as Circuit } from '@shared/schemas/plant';
import { CircuitSummary } from './circuit-summary';
import { TankTile } from './tank-tile';
import type { TankStatus } from './tank-status';

/** One circuit: summary at the row start, then tanks left to right as the slurry flows. */
export function CircuitRow({
  circuit,
  statuses,
  columns,
  siteName,
  nowMs,
}: {
  circuit: Circuit;
  statuses: TankStatus[];
  columns: number;
  siteName?: string;
  nowMs: number;
}) {
  return (
    <section
      aria-label={`${circuit.name}, tanks in flow order`}
      className="grid min-h-0 gap-3"
      style={{ gridTemplateColumns: `minmax(9rem, 11rem) repeat(${columns}, minmax(0, 1fr))` }}
    >
      <CircuitSummary circuit={circuit} statuses={statuses} siteName={siteName} />
      {circuit.tanks.map((tank, i) => (
        <div key={tank.id} className="relative min-h-0 min-w-0">
          {i > 0 && (
            <span aria-hidden="true" className="absolute top-1/2 -left-2.5 -translate-y-1/2 text-sm text-ink-muted">
              ›
            </span>
          )}
          <TankTile tank={tank} status={statuses[i]} nowMs={nowMs} />
        </div>
      ))}
    </section>
  );
}
