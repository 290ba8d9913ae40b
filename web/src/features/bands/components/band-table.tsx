import type { BandRow } from '@shared/schemas/bands';
import { Button } from '../../../components/ui/button';
import { Quantity } from '../../../components/ui/quantity';
import { formatMv, formatRatio, formatTempC } from '../../../lib/format';

type Props = { rows: BandRow[]; selected: number | null; canChange: boolean; onChange: (row: BandRow) => void; onCopy: (row: BandRow) => void; onHistory: (row: BandRow) => void };

/** One circuit's tanks in train order: band as ratio and as probe mV at the tank's temperature now. */
export function BandTable({ rows, selected, canChange, onChange, onCopy, onHistory }: Props) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <thead className="text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">Tank</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Low</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Target</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">High</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">As probe mV (low · high)</th>
            <th scope="col" className="px-3 py-2 font-semibold">Change control</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold"><span className="sr-only">Actions</span></th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.tankId} className={`border-t border-line ${selected === r.tankId ? 'bg-panel-2' : ''}`}>
              <th scope="row" className="px-3 py-2 text-left">
                <span className="font-bold">{r.tankTag}</span> <span className="font-normal text-ink-muted">{r.tankName}</span>
              </th>
              <td className="px-3 py-2 text-right"><Quantity value={formatRatio(r.band.low)} /></td>
              <td className="px-3 py-2 text-right">{r.band.target == null ? <span className="text-ink-muted">—</span> : <Quantity value={formatRatio(r.band.target)} />}</td>
              <td className="px-3 py-2 text-right"><Quantity value={formatRatio(r.band.high)} /></td>
              <td className="px-3 py-2 text-right">
                {r.mv ? (
                  <span title={`${r.mv.referenceLabel}, calibration v${r.mv.calibrationVersion}`}>
                    <Quantity value={`${formatMv(r.mv.lowMv)} · ${formatMv(r.mv.highMv)}`} unit="mV" />
                    <span className="ml-1 text-ink-muted">at {formatTempC(r.mv.tempC)} °C</span>
                  </span>
                ) : (
                  <span className="text-ink-muted">{r.mvNote ?? '—'}</span>
                )}
              </td>
              <td className="px-3 py-2">
                {r.pending ? (
                  <span className="rounded-sm border border-line-strong px-1.5 font-semibold">
                    <span aria-hidden="true">◷ </span>Awaiting approval: {formatRatio(r.pending.new.low)}–{formatRatio(r.pending.new.high)}
                  </span>
                ) : (
                  <span className="text-ink-muted">—</span>
                )}
              </td>
              <td className="px-3 py-2">
                <div className="flex justify-end gap-2">
                  <Button size="sm" variant="ghost" onClick={() => onHistory(r)}>Record</Button>
                  {canChange && (
                    <>
                      <Button size="sm" variant="ghost" onClick={() => onCopy(r)} disabled={!!r.pending}>Copy…</Button>
                      <Button size="sm" onClick={() => onChange(r)} disabled={!!r.pending}>Change…</Button>
                    </>
                  )}
                </div>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
