import type { Assay } from '@shared/schemas/assays';
import { formatMv, formatRatio } from '../../../lib/format';
import { isoToSiteLocal } from '@shared/time/site-time';

export type Exclusions = Record<number, string>;

type Props = { assays: Assay[]; excluded: Exclusions; onChange: (next: Exclusions) => void; timeZone: string; windowMin: number };

/** The window's assays, each used unless excluded; an exclusion needs a reason, kept with the fit. */
export function AssayChoice({ assays, excluded, onChange, timeZone, windowMin }: Props) {
  const toggle = (id: number) => {
    const next = { ...excluded };
    if (id in next) delete next[id];
    else next[id] = '';
    onChange(next);
  };
  return (
    <ul className="max-h-80 divide-y divide-line overflow-auto rounded-md border border-line">
      {assays.map((a) => {
        const out = a.id in excluded;
        const usable = a.labRatio != null && a.match.n > 0;
        return (
          <li key={a.id} className="flex flex-col gap-1 px-3 py-2 text-sm">
            <label className="flex flex-wrap items-center gap-x-3 gap-y-1">
              <input type="checkbox" checked={!out} onChange={() => toggle(a.id)} className="h-4 w-4" aria-label={`Use the assay of ${a.sampledAt}`} />
              <span className={`tabular-nums ${out ? 'text-offline-ink line-through' : ''}`}>{isoToSiteLocal(a.sampledAt, timeZone).replace('T', ' ')}</span>
              <span className="tabular-nums">lab {formatRatio(a.labRatio)}</span>
              <span className="tabular-nums text-ink-muted">
                {a.match.n > 0 ? `probe ${formatRatio(a.match.probeRatio)} · ${formatMv(a.match.diffMv)} mV` : `no readings within ±${windowMin} min`}
              </span>
              {!usable && <span className="text-ink-muted">(cannot be used)</span>}
            </label>
            {out && (
              <input
                value={excluded[a.id]}
                onChange={(e) => onChange({ ...excluded, [a.id]: e.target.value })}
                placeholder="Why is this assay left out?"
                aria-label={`Reason for leaving out the assay of ${a.sampledAt}`}
                className="ml-7 h-8 rounded-md border border-line-strong bg-panel px-2"
              />
            )}
          </li>
        );
      })}
    </ul>
  );
}
