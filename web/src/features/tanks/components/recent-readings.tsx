import type { RecentReading } from '@shared/schemas/plant';
import { formatDateTime, formatMv, formatRatio, formatTempC } from '../../../lib/format';

/**
 * The newest stored readings with the calibration each was converted with: a late reading keeps
 * the calibration valid at its own time, so versions can differ from the one in force now.
 */
export function RecentReadings({ readings, timeZone }: { readings: RecentReading[]; timeZone: string }) {
  if (readings.length === 0) return null;
  return (
    <section aria-label="Newest readings" className="mt-4 flex flex-col gap-1">
      <h2 className="text-sm font-bold uppercase tracking-wide text-ink-muted">Newest readings (at page load)</h2>
      <table className="w-full text-right text-sm tabular-nums">
        <thead>
          <tr className="text-ink-muted"><th className="text-left font-normal">Time</th><th className="font-normal">mV</th><th className="font-normal">°C</th><th className="font-normal">Ratio</th><th className="font-normal">Calibration</th></tr>
        </thead>
        <tbody>
          {readings.map((r) => (
            <tr key={r.ts} data-testid="recent-reading">
              <td className="text-left">{formatDateTime(r.ts, timeZone)}</td>
              <td>{formatMv(r.orpMv)}</td>
              <td>{formatTempC(r.tempC)}</td>
              <td>{formatRatio(r.ratio)}</td>
              <td>v{r.calibrationVersion}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </section>
  );
}
