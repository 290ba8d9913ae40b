import type { FitPoint } from '@shared/schemas/calibration';
import { formatFixed, formatRatio, formatTempC } from '../../../lib/format';
import { isoToSiteLocal } from '@shared/time/site-time';

/** The fitted assays one by one: the same numbers as the chart, readable without it. */
export function FitPointsTable({ points, timeZone, onExclude }: { points: FitPoint[]; timeZone: string; onExclude?: (assayId: number) => void }) {
  return (
    <div className="max-h-72 overflow-auto">
      <table className="w-full text-right text-sm tabular-nums">
        <thead className="sticky top-0 bg-panel text-ink-muted">
          <tr>
            <th scope="col" className="px-2 py-1 text-left font-semibold">Sampled</th>
            <th scope="col" className="px-2 py-1 font-semibold">Lab ratio</th>
            <th scope="col" className="px-2 py-1 font-semibold">Probe mV</th>
            <th scope="col" className="px-2 py-1 font-semibold">°C</th>
            <th scope="col" className="px-2 py-1 font-semibold">Residual, new</th>
            <th scope="col" className="px-2 py-1 font-semibold">Residual, in force</th>
            <th scope="col" className="px-2 py-1 font-semibold">Studentized</th>
            <th scope="col" className="px-2 py-1 font-semibold"><span className="sr-only">Action</span></th>
          </tr>
        </thead>
        <tbody>
          {points.map((p) => (
            <tr key={p.assayId} className={`border-t border-line ${p.suspect ? 'bg-attention-2-soft' : ''}`} data-suspect={p.suspect || undefined}>
              <td className="px-2 py-1 text-left">
                {p.suspect && <span className="font-semibold text-attention-2-ink">◆ Suspect </span>}
                {isoToSiteLocal(p.sampledAt, timeZone).replace('T', ' ')}
              </td>
              <td className="px-2 py-1">{formatRatio(p.labRatio)}</td>
              <td className="px-2 py-1">{formatFixed(p.orpMv, 1)}</td>
              <td className="px-2 py-1">{formatTempC(p.tempC)}</td>
              <td className="px-2 py-1">{formatFixed(p.residualMv, 1)} mV</td>
              <td className="px-2 py-1">{p.currentResidualMv == null ? '—' : `${formatFixed(p.currentResidualMv, 1)} mV`}</td>
              <td className="px-2 py-1">{p.studentizedResidual == null ? '—' : Number.isFinite(p.studentizedResidual) ? formatFixed(p.studentizedResidual, 1) : 'very large'}</td>
              <td className="px-2 py-1">
                {p.suspect && onExclude && (
                  <button type="button" className="text-info-ink underline" onClick={() => onExclude(p.assayId)}>Exclude…</button>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
