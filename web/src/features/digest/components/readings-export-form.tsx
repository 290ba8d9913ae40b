import { useState } from 'react';
import type { ExportSource } from '@shared/schemas/export';
import { addDays, localDateOf, zonedTimeToUtc } from '@shared/time/site-time';
import { Panel } from '../../../components/ui/panel';
import { SelectField, TextField } from '../../../components/ui/field';
import { serverNow } from '../../../lib/clock';
import { exportReadingsUrl } from '../api/export-readings';

export type TankChoice = { id: number; tag: string; circuitTag: string };

const SOURCES = [
  { value: '1m', label: '1-minute summaries (count, mean, min, max)' },
  { value: '1h', label: '1-hour summaries' },
  { value: 'raw', label: 'Every reading (large)' },
];

/** Chosen tanks and site-time days → a link to the streamed CSV. */
export function ReadingsExportForm({ tanks, timeZone }: { tanks: TankChoice[]; timeZone: string }) {
  const today = localDateOf(serverNow(), timeZone);
  const [chosen, setChosen] = useState<Set<number>>(() => new Set(tanks.map((t) => t.id)));
  const [fromDay, setFromDay] = useState(addDays(today, -1));
  const [toDay, setToDay] = useState(today);
  const [source, setSource] = useState<ExportSource>('1m');
  const toggle = (id: number) => setChosen((s) => {
    const next = new Set(s);
    if (next.has(id)) next.delete(id);
    else next.add(id);
    return next;
  });
  const ok = chosen.size > 0 && fromDay && toDay && fromDay <= toDay;
  const href = ok
    ? exportReadingsUrl({
      tankIds: [...chosen], source,
      from: new Date(zonedTimeToUtc(fromDay, 0, timeZone)).toISOString(),
      to: new Date(zonedTimeToUtc(addDays(toDay, 1), 0, timeZone)).toISOString(),
    })
    : undefined;

  return (
    <Panel title="Export readings">
      <div className="flex flex-col gap-3">
        <fieldset className="flex flex-wrap gap-x-4 gap-y-1">
          <legend className="mb-1 text-sm font-semibold">Tanks</legend>
          {tanks.map((t) => (
            <label key={t.id} className="inline-flex items-center gap-1.5">
              <input type="checkbox" checked={chosen.has(t.id)} onChange={() => toggle(t.id)} />
              {t.tag}
            </label>
          ))}
        </fieldset>
        <div className="grid gap-3 sm:grid-cols-3">
          <TextField label="From (site date)" type="date" value={fromDay} max={toDay} onChange={(e) => setFromDay(e.target.value)} />
          <TextField label="To (site date, inclusive)" type="date" value={toDay} min={fromDay} onChange={(e) => setToDay(e.target.value)} />
          <SelectField label="What" options={SOURCES} value={source} onChange={(e) => setSource(e.target.value as ExportSource)} />
        </div>
        <p className="text-sm text-ink-muted">
          Times in the file are UTC (ISO 8601). Each column names its unit: orp_mv, temp_c, eh_v; ratios are Fe³⁺/Fe²⁺.
        </p>
        <div className="flex justify-end">
          {href ? (
            <a href={href} download className="inline-flex h-10 items-center rounded-md border border-ink bg-ink px-4 font-semibold text-canvas hover:opacity-90">
              Download CSV
            </a>
          ) : (
            <span className="text-sm text-ink-muted">Choose at least one tank and a valid range.</span>
          )}
        </div>
      </div>
    </Panel>
  );
}
