import type { CalibrationVersion } from '@shared/schemas/calibration';
import { formatFixed } from '../../../lib/format';
import { isoToSiteLocal } from '@shared/time/site-time';

/** Every calibration version of the tank, newest (in force) first. */
export function VersionsTable({ versions, timeZone }: { versions: CalibrationVersion[]; timeZone: string }) {
  return (
    <table className="w-full text-left text-sm">
      <thead className="text-ink-muted">
        <tr>
          <th scope="col" className="px-2 py-1 font-semibold">Version</th>
          <th scope="col" className="px-2 py-1 text-right font-semibold">E°′ 25 °C</th>
          <th scope="col" className="px-2 py-1 text-right font-semibold">k</th>
          <th scope="col" className="px-2 py-1 font-semibold">From (site time)</th>
          <th scope="col" className="px-2 py-1 font-semibold">Fit</th>
          <th scope="col" className="px-2 py-1 font-semibold">Reason · by</th>
        </tr>
      </thead>
      <tbody>
        {versions.map((v, i) => (
          <tr key={v.version} className="border-t border-line">
            <td className="px-2 py-1 font-semibold">
              v{v.version} {i === 0 && <span className="font-normal text-ink-muted">(in force)</span>}
            </td>
            <td className="px-2 py-1 text-right tabular-nums">{formatFixed(v.formalPotentialV, 4)} V</td>
            <td className="px-2 py-1 text-right tabular-nums">{formatFixed(v.formalCoeffVPerK * 1000, 2)} mV/K</td>
            <td className="px-2 py-1 tabular-nums">{isoToSiteLocal(v.validFrom, timeZone).replace('T', ' ')}</td>
            <td className="px-2 py-1 tabular-nums">{v.fit ? `${v.fit.n} assays, rms ${formatFixed(v.fit.rmsMv, 1)} mV` : '—'}</td>
            <td className="px-2 py-1">
              {v.reason}
              {v.createdBy && <span className="text-ink-muted"> · {v.createdBy.name}</span>}
            </td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}
