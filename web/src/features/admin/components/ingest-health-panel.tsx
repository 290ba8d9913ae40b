import { Panel } from '../../../components/ui/panel';
import { Quantity } from '../../../components/ui/quantity';
import { useNow } from '../../../lib/clock';
import { formatAge, formatDateTime } from '../../../lib/format';
import { useIngestHealth, type IngestHealth } from '../api/get-ingest-health';
import { IngestWatch } from './ingest-watch';
import { PartsList } from './parts-list';

const count = (n: number) => n.toLocaleString('en-GB');
const ms = (v: number | null) => (v == null ? '—' : v < 10 ? v.toFixed(1) : String(Math.round(v)));

const FIGURES: Array<{ key: keyof IngestHealth; label: string; render: (h: IngestHealth) => [string, string?]; warn?: (h: IngestHealth) => boolean }> = [
  { key: 'messages', label: 'Messages', render: (h) => [count(h.messages)] },
  { key: 'readingsStored', label: 'Readings stored', render: (h) => [count(h.readingsStored)] },
  { key: 'deadLetters', label: 'Dead letters', render: (h) => [count(h.deadLetters)], warn: (h) => h.deadLetters > 0 },
  { key: 'conflicts', label: 'Conflicts', render: (h) => [count(h.conflicts)], warn: (h) => h.conflicts > 0 },
  { key: 'duplicates', label: 'Duplicates skipped', render: (h) => [count(h.duplicates)] },
  { key: 'lagS', label: 'Newest reading age', render: (h) => [h.lagS == null ? '—' : h.lagS.toFixed(1), 's'], warn: (h) => (h.lagS ?? 0) > 30 },
  { key: 'flushP50Ms', label: 'Commit p50', render: (h) => [ms(h.flushP50Ms), 'ms'] },
  { key: 'flushP99Ms', label: 'Commit p99', render: (h) => [ms(h.flushP99Ms), 'ms'] },
  { key: 'ackP99Ms', label: 'Receive → ack p99', render: (h) => [ms(h.ackP99Ms), 'ms'] },
  { key: 'queued', label: 'Awaiting commit', render: (h) => [count(h.queued)] },
  { key: 'flushErrors', label: 'Failed commits', render: (h) => [count(h.flushErrors)], warn: (h) => h.flushErrors > 0 || !h.dbUp },
  { key: 'mqttConnected', label: 'Broker link', render: (h) => [h.mqttConnected ? 'up' : 'down'], warn: (h) => !h.mqttConnected },
];

/** deskPath: the Alarm desk, where the "ingest stopped" alarm is acknowledged. */
export function IngestHealthPanel({ timeZone, deskPath }: { timeZone: string; deskPath: string }) {
  const health = useIngestHealth();
  const now = useNow();
  const h = health.data?.health;
  const edge = health.data?.broker;

  return (
    <Panel title="Ingest health">
      {health.isError ? (
        <p className="text-sm text-attention-1-ink">{health.error.message}</p>
      ) : health.isPending ? (
        <p className="text-sm text-ink-muted">Loading…</p>
      ) : !h ? (
        <p className="text-sm text-ink-muted">No figures from the ingest worker yet: it publishes them every 30 s once connected.</p>
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
            Figures from the ingest worker since {formatDateTime(h.startedAt, timeZone)} site time, updated {formatAge((now - Date.parse(h.at)) / 1000)}.
          </p>
          {edge && (
            <p className="mt-1 text-sm text-ink-muted" data-testid="edge-dead-letters">
              The embedded broker dead-lettered <span className="font-semibold tabular-nums text-ink">{count(edge.deadLetteredAtEdge)}</span> messages
              that broke the device contract since {formatDateTime(edge.startedAt, timeZone)}; they never reached the worker.
            </p>
          )}
        </>
      )}
      {health.data && <IngestWatch workers={health.data.workers} alarm={health.data.ingestAlarm} deskPath={deskPath} />}
      {health.data?.parts && health.data.parts.length > 0 && <PartsList parts={health.data.parts} now={now} />}
    </Panel>
  );
}
