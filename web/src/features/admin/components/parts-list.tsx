import { formatAge } from '../../../lib/format';
import type { PartState } from '../api/get-ingest-health';

const STATE_TEXT: Record<PartState['state'], string> = { running: 'running', restarting: 'restarting', stopped: 'stopped' };

/** The supervisor's view of each process: a crash-looping part shows here while the rest keep running. */
export function PartsList({ parts, now }: { parts: PartState[]; now: number }) {
  return (
    <table className="mt-4 w-full text-sm" data-testid="parts-list">
      <caption className="mb-1 text-left text-xs text-ink-muted">Processes (restarted with a growing pause while one keeps stopping)</caption>
      <thead>
        <tr className="text-left text-xs text-ink-muted">
          <th className="font-normal">Part</th>
          <th className="font-normal">State</th>
          <th className="text-right font-normal">Restarts (last hour)</th>
          <th className="font-normal">Last exit</th>
        </tr>
      </thead>
      <tbody>
        {parts.map((p) => {
          const down = p.state !== 'running';
          return (
            <tr key={p.name} data-part={p.name} data-state={p.state}>
              <td>{p.name}</td>
              <td className={down ? 'font-semibold text-attention-2-ink' : ''}>
                {down && <span aria-hidden="true">▲ </span>}
                {STATE_TEXT[p.state]}
                {p.state === 'restarting' && p.nextStartAt && ` (next try in ${formatAge(Math.max(0, (Date.parse(p.nextStartAt) - now) / 1000)).replace(/ ago$/, '')})`}
              </td>
              <td className="text-right tabular-nums">
                {p.restarts} ({p.restartsLastHour})
              </td>
              <td className="text-ink-muted">{p.lastExit ? `${p.lastExit.how}, ${formatAge((now - Date.parse(p.lastExit.at)) / 1000)}` : '—'}</td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}
