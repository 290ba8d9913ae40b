import type { CircuitSummary as Circuit } from '@shared/schemas/plant';
import type { TankStatus } from './tank-status';

/** Row start: the circuit, how many tanks are in band, and which tank is worst. */
export function CircuitSummary({ circuit, statuses, siteName }: { circuit: Circuit; statuses: TankStatus[]; siteName?: string }) {
  const total = circuit.tanks.length;
  const inBand = statuses.filter((s) => s.kind === 'live' && s.position === 'in').length;
  const stale = statuses.filter((s) => s.kind === 'stale' || s.kind === 'no-reading').length;
  const offline = statuses.filter((s) => s.kind === 'offline').length;
  const worst =
    circuit.tanks
      .map((tank, i) => ({ tag: tank.tag, status: statuses[i] }))
      .filter((x) => x.status.decadesOut > 0)
      .sort((a, b) => b.status.decadesOut - a.status.decadesOut)[0] ?? null;

  return (
    <div className="flex h-full min-w-0 flex-col gap-2 rounded-lg border border-line bg-panel-2 p-3">
      {siteName && <div className="text-xs text-ink-muted">{siteName}</div>}
      <h2 className="text-xl font-bold leading-tight">{circuit.name}</h2>
      <div className="text-xs uppercase tracking-wide text-ink-muted">{circuit.tag}</div>
      <div className="mt-1" data-testid="circuit-in-band">
        <div className="text-xs text-ink-muted">In band</div>
        <div className="text-2xl font-bold tabular-nums">
          {inBand}
          <span className="text-base font-normal text-ink-muted"> / {total}</span>
        </div>
      </div>
      <div>
        <div className="text-xs text-ink-muted">Worst tank</div>
        {worst ? (
          <div className="font-semibold text-ink">
            <span aria-hidden="true">{worst.status.position === 'below' ? '▼ ' : '▲ '}</span>
            {worst.tag} {worst.status.position === 'below' ? 'below' : 'above'} band
          </div>
        ) : (
          <div className="text-ink-muted">None out of band</div>
        )}
      </div>
      {(stale > 0 || offline > 0) && (
        <div className="text-sm text-offline-ink">
          {stale > 0 && <div>{stale} not live</div>}
          {offline > 0 && <div>{offline} out of service</div>}
        </div>
      )}
      <div className="mt-auto text-xs text-ink-muted" aria-hidden="true">
        Slurry flow →
      </div>
    </div>
  );
}
