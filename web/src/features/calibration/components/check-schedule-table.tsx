import type { ProbeDue } from '@shared/schemas/probe-checks';
import { formatFixed } from '../../../lib/format';
import { isoToSiteLocal } from '@shared/time/site-time';

const BASIS: Record<ProbeDue['basis'], string> = {
  'last-pass': 'interval since the last pass',
  'failed-check': 'last check failed',
  replacement: 'replaced since the last check',
  installation: 'never checked',
};

/** Due dates per probe; an overdue one is marked by shape and words as well as colour. */
export function CheckScheduleTable({ probes, timeZone, selectedProbeId }: { probes: ProbeDue[]; timeZone: string; selectedProbeId?: number }) {
  const at = (iso: string) => isoToSiteLocal(iso, timeZone).replace('T', ' ');
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <thead className="text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-1.5 font-semibold">Probe</th>
            <th scope="col" className="px-3 py-1.5 text-right font-semibold">Interval</th>
            <th scope="col" className="px-3 py-1.5 font-semibold">Last check</th>
            <th scope="col" className="px-3 py-1.5 font-semibold">Due (site time)</th>
            <th scope="col" className="px-3 py-1.5 font-semibold">Status</th>
          </tr>
        </thead>
        <tbody>
          {probes.map((p) => (
            <tr key={p.probeId} className={`border-t border-line ${p.probeId === selectedProbeId ? 'bg-panel-2' : ''}`}>
              <th scope="row" className="px-3 py-1.5 text-left font-semibold">
                {p.probeTag} <span className="font-normal text-ink-muted">tank {p.tankTag}</span>
              </th>
              <td className="px-3 py-1.5 text-right tabular-nums">{formatFixed(p.intervalDays, p.intervalDays % 1 ? 1 : 0)} d</td>
              <td className="px-3 py-1.5 tabular-nums">
                {p.lastCheck ? `${at(p.lastCheck.at)} · ${p.lastCheck.pass ? 'pass' : 'FAIL'} (${formatFixed(p.lastCheck.errorMv, 1)} mV)` : '—'}
              </td>
              <td className="px-3 py-1.5 tabular-nums">
                {at(p.dueAt)} <span className="text-ink-muted">({BASIS[p.basis]})</span>
              </td>
              <td className="px-3 py-1.5">
                {p.overdue ? (
                  <span className="inline-flex items-center gap-1 rounded-sm bg-attention-2-soft px-1.5 font-semibold text-attention-2-ink">
                    <span aria-hidden="true">▲</span>Overdue
                  </span>
                ) : (
                  <span className="text-ink-muted">Up to date</span>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
