import { useState } from 'react';
import type { Assay } from '@shared/schemas/assays';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { Quantity } from '../../../components/ui/quantity';
import { formatMv, formatRatio, formatTempC } from '../../../lib/format';
import { formMessage } from '../../../lib/form';
import { isoToSiteLocal } from '@shared/time/site-time';
import { useRetractAssay } from '../api/retract-assay';

const g = (v: number) => Number(v.toPrecision(4)).toString();

function RetractRow({ assay, onDone }: { assay: Assay; onDone: () => void }) {
  const [reason, setReason] = useState('');
  const retract = useRetractAssay();
  return (
    <tr>
      <td colSpan={10} className="bg-panel-2 px-3 py-3">
        <FormError>{formMessage(retract.error)}</FormError>
        <div className="flex flex-col gap-2 sm:flex-row sm:items-end">
          <div className="flex-1">
            <TextField label={`Why retract the ${assay.tankTag} assay?`} value={reason} onChange={(e) => setReason(e.target.value)} hint="The assay stays in the record, marked retracted." />
          </div>
          <Button onClick={onDone}>Cancel</Button>
          <Button variant="danger" disabled={reason.trim().length < 3 || retract.isPending} onClick={() => retract.mutate({ id: assay.id, reason }, { onSuccess: onDone })}>
            Retract assay
          </Button>
        </div>
      </td>
    </tr>
  );
}

/** Lab results with the probe's view of the same moment: lab ratio, probe ratio, difference in mV. */
export function AssayTable({ assays, timeZone, canRetract, windowMin }: { assays: Assay[]; timeZone: string; canRetract: boolean; windowMin: number }) {
  const [retracting, setRetracting] = useState<number | null>(null);
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-sm">
        <thead className="text-ink-muted">
          <tr>
            <th scope="col" className="px-3 py-2 font-semibold">Sampled (site time)</th>
            <th scope="col" className="px-3 py-2 font-semibold">Tank</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Fe²⁺ · total Fe</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Lab ratio</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Probe ratio</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Probe − lab</th>
            <th scope="col" className="px-3 py-2 text-right font-semibold">Readings ±{windowMin} min</th>
            <th scope="col" className="px-3 py-2 font-semibold">Method · analyst · lab ref</th>
            <th scope="col" className="px-3 py-2 font-semibold">Source</th>
            <th scope="col" className="px-3 py-2"><span className="sr-only">Actions</span></th>
          </tr>
        </thead>
        <tbody>
          {assays.map((a) => (
            <FragmentRows key={a.id} a={a} timeZone={timeZone} canRetract={canRetract} retracting={retracting === a.id} setRetracting={setRetracting} />
          ))}
        </tbody>
      </table>
    </div>
  );
}

function FragmentRows({ a, timeZone, canRetract, retracting, setRetracting }: { a: Assay; timeZone: string; canRetract: boolean; retracting: boolean; setRetracting: (id: number | null) => void }) {
  const m = a.match;
  const dim = a.retracted ? 'text-offline-ink line-through' : '';
  return (
    <>
      <tr className="border-t border-line">
        <td className={`px-3 py-2 tabular-nums ${dim}`}>{isoToSiteLocal(a.sampledAt, timeZone).replace('T', ' ')}</td>
        <td className="px-3 py-2 font-semibold">{a.tankTag}</td>
        <td className={`px-3 py-2 text-right ${dim}`}><Quantity value={`${g(a.fe2GPerL)} · ${g(a.feTotalGPerL)}`} unit="g/L" /></td>
        <td className="px-3 py-2 text-right"><Quantity value={formatRatio(a.labRatio)} /></td>
        <td className="px-3 py-2 text-right">{m.probeRatio == null ? <span className="text-ink-muted">no readings</span> : <Quantity value={formatRatio(m.probeRatio)} />}</td>
        <td className="px-3 py-2 text-right">
          {m.diffMv == null ? '—' : <Quantity value={formatMv(m.diffMv)} unit="mV" />}
          {m.tempC != null && <span className="ml-1 text-ink-muted">at {formatTempC(m.tempC)} °C</span>}
        </td>
        <td className="px-3 py-2 text-right tabular-nums">{m.n}</td>
        <td className="px-3 py-2">{[a.method, a.analyst, a.labRef].filter(Boolean).join(' · ') || '—'}</td>
        <td className="px-3 py-2 text-ink-muted">
          {a.retracted ? `Retracted: ${a.retracted.reason}` : a.source === 'form' ? `entered by ${a.createdBy.name}` : a.source.replace(/^csv:/, 'file ')}
        </td>
        <td className="px-3 py-2 text-right">
          {canRetract && !a.retracted && <Button size="sm" variant="ghost" onClick={() => setRetracting(a.id)}>Retract…</Button>}
        </td>
      </tr>
      {retracting && <RetractRow assay={a} onDone={() => setRetracting(null)} />}
    </>
  );
}
