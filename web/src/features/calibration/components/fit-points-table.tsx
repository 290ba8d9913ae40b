import type { FitPoint } from '@shared/schemas/calibration';
import { formatFixed, formatRatio, formatTempC } from '../../../lib/format';
import { isoToSiteLocal } from '@shared/time/site-time';

/** The fitted assays one by one: the same numbers as the chart, readable without it. */
export function FitPointsTable({ points, timeZone }: { points: FitPoint[]; timeZone: string }) {
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
          </tr>
        </thead>
        <tbody>
          {points.map((p) => (
            <tr key={p.assayId} className="border-t border-line">
              <td className="px-2 py-1 text-left">{isoToSiteLocal(p.sampledAt, timeZone).replace('T', ' ')}</td>
              <td className="px-2 py-1">{formatRatio(p.labRatio)}</td>
              <td className="px-2 py-1">{formatFixed(p.orpMv, 1)}</td>
              <td className="px-2 py-1">{formatTempC(p.tempC)}</td>
              <td className="px-2 py-1">{formatFixed(p.residualMv, 1)} mV</td>
              <td className="px-2 py-1">{p.currentResidualMv == null ? '—' : `${formatFixed(p.currentResidualMv, 1)} mV`}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
