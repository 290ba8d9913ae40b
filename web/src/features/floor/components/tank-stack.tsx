import type { CircuitSummary, SiteSummary } from '@shared/schemas/plant';
import { useTankAlarms } from '../../../lib/tank-alarms';
import { TankCard } from './tank-card';
import type { TankStatus } from './tank-status';
import { worstFirst } from './tile-look';

type Row = { site: SiteSummary; circuit: CircuitSummary; statuses: TankStatus[] };

/** Narrow screens: every tank as a compact card, worst first (the phone is what the on-call engineer carries). */
export function TankStack({ rows, nowMs }: { rows: Row[]; nowMs: number }) {
  const { badges } = useTankAlarms();
  const tanks = rows
    .flatMap(({ circuit, statuses }) => circuit.tanks.map((tank, i) => ({ tank, circuit, status: statuses[i], alarm: badges.get(tank.id) })))
    .sort(worstFirst);
  return (
    <ul className="grid grid-cols-1 gap-2 sm:grid-cols-2" aria-label="Tanks, worst first" data-testid="tank-stack">
      {tanks.map(({ tank, circuit, status }) => (
        <li key={tank.id} className="min-w-0">
          <TankCard tank={tank} status={status} nowMs={nowMs} circuitName={circuit.name} />
        </li>
      ))}
    </ul>
  );
}
