import { useState, type FormEvent } from 'react';
import { Button } from '../../../components/ui/button';
import { TextField } from '../../../components/ui/field';
import { serverNow } from '../../../lib/clock';
import { formatDuration } from '../../../lib/format';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import { PRESETS, type Preset, type TrendRange } from '../api/get-trend';

const LABELS: Record<Preset, string> = { '1h': '1 h', '8h': '8 h', '24h': '24 h', '7d': '7 d', '30d': '30 d' };

function CustomRange({ range, timeZone, onApply }: { range: TrendRange; timeZone: string; onApply: (r: TrendRange) => void }) {
  const initial = range.kind === 'custom' ? range : { from: new Date(serverNow() - 86_400_000).toISOString(), to: new Date(serverNow()).toISOString() };
  const [from, setFrom] = useState(() => isoToSiteLocal(initial.from, timeZone));
  const [to, setTo] = useState(() => isoToSiteLocal(initial.to, timeZone));
  const [errors, setErrors] = useState<{ from?: string; to?: string }>({});

  const apply = (e: FormEvent) => {
    e.preventDefault();
    const fromIso = siteLocalToIso(from, timeZone);
    const toIso = siteLocalToIso(to, timeZone);
    const next: typeof errors = {};
    if (!fromIso) next.from = 'Enter a start date and time';
    if (!toIso) next.to = 'Enter an end date and time';
    if (fromIso && toIso && Date.parse(fromIso) >= Date.parse(toIso)) next.to = 'The end must be after the start';
    setErrors(next);
    if (fromIso && toIso && !next.from && !next.to) onApply({ kind: 'custom', from: fromIso, to: toIso });
  };

  return (
    <form onSubmit={apply} noValidate className="flex flex-wrap items-start gap-3" aria-label="Custom range">
      <TextField label="From (site time)" type="datetime-local" value={from} onChange={(e) => setFrom(e.target.value)} error={errors.from} />
      <TextField label="To (site time)" type="datetime-local" value={to} onChange={(e) => setTo(e.target.value)} error={errors.to} />
      <Button type="submit" variant="primary" className="mt-6">
        Show
      </Button>
    </form>
  );
}

/** 1 h … 30 d end "now" and follow live; a custom range is fixed. */
/** What the trend's end means: following live readings, stale (none arriving), or a fixed range. */
function LiveState({ range, staleForS }: { range: TrendRange; staleForS: number | null | undefined }) {
  const state = range.kind !== 'preset' ? 'fixed' : staleForS !== undefined ? 'stale' : 'live';
  const text =
    state === 'fixed'
      ? 'Fixed range.'
      : state === 'stale'
        ? `Stale: no new reading${staleForS != null ? ` for ${formatDuration(staleForS)}` : ''}; the trend ends at the last one received.`
        : 'Live: new readings are added as they arrive.';
  return (
    <span className={`ml-2 text-sm ${state === 'stale' ? 'font-semibold text-offline-ink' : 'text-ink-muted'}`} data-testid="trend-live-state" data-state={state}>
      {text}
    </span>
  );
}

/** `staleForS`: set (seconds, or null when unknown) while the tank's readings have stopped arriving. */
export function RangePicker({ range, timeZone, onChange, staleForS }: { range: TrendRange; timeZone: string; onChange: (r: TrendRange) => void; staleForS?: number | null }) {
  const [customOpen, setCustomOpen] = useState(range.kind === 'custom');
  const active = range.kind === 'preset' ? range.preset : 'custom';
  const pill = (on: boolean) =>
    `h-8 rounded-md px-3 text-sm font-semibold border ${on ? 'bg-ink text-canvas border-ink' : 'bg-panel text-ink border-line-strong hover:bg-panel-2'}`;

  return (
    <div className="flex flex-col gap-2">
      <div role="group" aria-label="Trend range" className="flex flex-wrap items-center gap-1.5">
        {(Object.keys(PRESETS) as Preset[]).map((p) => (
          <button
            key={p}
            type="button"
            aria-pressed={active === p}
            className={pill(active === p)}
            onClick={() => {
              setCustomOpen(false);
              onChange({ kind: 'preset', preset: p });
            }}
          >
            {LABELS[p]}
          </button>
        ))}
        <button type="button" aria-pressed={active === 'custom'} aria-expanded={customOpen} className={pill(active === 'custom' || customOpen)} onClick={() => setCustomOpen((o) => !o)}>
          Custom…
        </button>
        <LiveState range={range} staleForS={staleForS} />
      </div>
      {customOpen && <CustomRange range={range} timeZone={timeZone} onApply={onChange} />}
    </div>
  );
}
