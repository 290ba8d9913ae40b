import { Panel } from '../../../components/ui/panel';
import { Quantity } from '../../../components/ui/quantity';
import { useNow } from '../../../lib/clock';
import { formatAge } from '../../../lib/format';
import { useIngestHealth, type IngestHealth } from '../api/get-ingest-health';

const count = (n: number) => n.toLocaleString('en-GB');
const ms = (v: number | null) => (v == null ? '—' : v < 10 ? v.toFixed(1) : String(Math.round(v)));

const FIGURES: Array<{ key: keyof IngestHealth; label: string; render: (h: IngestHealth) => [string, string?]; warn?: (h: IngestHealth) => boolean }> = [
  { key: 'messages', label: 'Messages', render: (h) => [count(h.messages)] },
  { key: 'readings', label: 'Readings stored', render: (h) => [count(h.readings)] },
  { key: 'deadLetters', label: 'Dead letters', render: (h) => [count(h.deadLetters)], warn: (h) => h.deadLetters > 0 },
  { key: 'conflicts', label: 'Conflicts', render: (h) => [count(h.conflicts)], warn: (h) => h.conflicts > 0 },
  { key: 'duplicates', label: 'Duplicates skipped', render: (h) => [count(h.duplicates)] },
  { key: 'lagMs', label: 'Lag', render: (h) => [ms(h.lagMs), 'ms'] },
  { key: 'batchP50Ms', label: 'Batch p50', render: (h) => [ms(h.batchP50Ms), 'ms'] },
  { key: 'batchP99Ms', label: 'Batch p99', render: (h) => [ms(h.batchP99Ms), 'ms'] },
];

export function IngestHealthPanel() {
  const health = useIngestHealth();
  const now = useNow();
  const h = health.data;

  return (
    <Panel title="Ingest health">
      {health.isError ? (
        <p className="text-sm text-attention-1-ink">{health.error.message}</p>
      ) : !h ? (
        <p className="text-sm text-ink-muted">Loading…</p>
      ) : (
        <>
          <dl className="grid grid-cols-2 gap-3 sm:grid-cols-4">
            {FIGURES.map((f) => {
              const [value, unit] = f.render(h);
              const warn = f.warn?.(h) ?? false;
              return (
                <div key={f.key} className={`rounded-md bg-panel-2 px-3 py-2 ${warn ? 'border-l-4 border-attention-3' : ''}`}>
                  <dt className="text-xs text-ink-muted">{f.label}</dt>
                  <dd className="text-xl">
                    <Quantity value={value} unit={unit} />
                    {warn && <span className="ml-1 text-xs font-semibold text-attention-3-ink">check</span>}
                  </dd>
                </div>
              );
            })}
          </dl>
          <p className="mt-3 text-sm text-ink-muted">
            {h.updatedAt ? `Figures from the ingest worker, updated ${formatAge((now - Date.parse(h.updatedAt)) / 1000)}.` : 'No figures from the ingest worker yet.'}
          </p>
        </>
      )}
    </Panel>
  );
}
