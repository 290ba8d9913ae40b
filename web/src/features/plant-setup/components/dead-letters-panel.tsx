import { useState } from 'react';
import { DEAD_LETTER_KINDS, DEAD_LETTER_KIND_LABELS, type DeadLetterKind, type DeadLetterQuery } from '@shared/schemas/dead-letters';
import { SelectField, TextField } from '../../../components/ui/field';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { CsvLink } from '../../../components/ui/csv-link';
import { Panel } from '../../../components/ui/panel';
import { formMessage } from '../../../lib/form';
import { deadLettersCsvUrl, useDeadLetters } from '../api/get-dead-letters';

type Filters = { site: string; gateway: string; probe: string; kind: string; from: string; to: string };
const EMPTY: Filters = { site: '', gateway: '', probe: '', kind: '', from: '', to: '' };

function toQuery(f: Filters): Partial<DeadLetterQuery> {
  const iso = (v: string) => (v && !Number.isNaN(Date.parse(v)) ? new Date(v).toISOString() : undefined);
  return {
    site: f.site || undefined, gateway: f.gateway || undefined, probe: f.probe || undefined,
    kind: (f.kind || undefined) as DeadLetterKind | undefined, from: iso(f.from), to: iso(f.to),
  };
}

/**
 * What devices sent that could not be stored, and readings that disagreed with one already
 * stored. Counts come from the tables; payloads are shown as text, never interpreted.
 */
export function DeadLettersPanel({ siteTags }: { siteTags: string[] }) {
  const [filters, setFilters] = useState<Filters>(EMPTY);
  const q = toQuery(filters);
  const page = useDeadLetters(q);
  const set = (k: keyof Filters) => (e: { target: { value: string } }) => setFilters((f) => ({ ...f, [k]: e.target.value }));
  const counts = page.data?.counts;

  return (
    <div className="flex flex-col gap-4">
      <Panel title="Filters">
        <div className="grid gap-3 p-4 sm:grid-cols-3 lg:grid-cols-6">
          <SelectField label="Site" value={filters.site} onChange={set('site')} options={[{ value: '', label: 'All' }, ...siteTags.map((t) => ({ value: t, label: t }))]} />
          <TextField label="Gateway" value={filters.gateway} onChange={set('gateway')} autoComplete="off" />
          <TextField label="Probe" value={filters.probe} onChange={set('probe')} autoComplete="off" />
          <SelectField label="Reason" value={filters.kind} onChange={set('kind')}
            options={[{ value: '', label: 'All' }, ...DEAD_LETTER_KINDS.map((k) => ({ value: k, label: DEAD_LETTER_KIND_LABELS[k] }))]} />
          <TextField label="From" type="datetime-local" value={filters.from} onChange={set('from')} />
          <TextField label="To" type="datetime-local" value={filters.to} onChange={set('to')} />
        </div>
      </Panel>
      {page.isPending ? <Loading label="Loading dead letters…" /> : page.isError ? <ErrorState title="Could not load" detail={formMessage(page.error) ?? ''} /> : (
        <>
          <p data-testid="dead-letter-counts" className="text-sm">
            <strong>{counts!.deadLetters}</strong> dead letters · <strong>{counts!.conflicts}</strong> conflicts
            {Object.keys(counts!.byKind).length > 0 && ` (${(Object.entries(counts!.byKind) as Array<[DeadLetterKind, number]>).map(([k, n]) => `${DEAD_LETTER_KIND_LABELS[k]} ${n}`).join(', ')})`}
            {' '}· each kept {page.data.retention.deadLetterDays} days, and a message sent again is kept once
          </p>
          <Panel title="Dead letters" actions={<CsvLink href={deadLettersCsvUrl(q, 'dead-letters')} label="Download dead letters as CSV" />}>
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <thead><tr className="border-b border-line"><th className="p-2">Received</th><th className="p-2">Gateway</th><th className="p-2">Topic</th><th className="p-2">Reason</th><th className="p-2">Payload</th></tr></thead>
                <tbody>
                  {page.data.deadLetters.map((d) => (
                    <tr key={d.id} className="border-b border-line align-top">
                      <td className="p-2 whitespace-nowrap">{d.receivedAt.replace('T', ' ').slice(0, 19)} UTC</td>
                      <td className="p-2 font-mono">{d.gateway ?? '—'}</td>
                      <td className="p-2 font-mono break-all">{d.topic}</td>
                      <td className="p-2"><span className="font-semibold">{DEAD_LETTER_KIND_LABELS[d.kind]}</span><br />{d.reason}</td>
                      <td className="p-2"><pre className="max-h-32 max-w-md overflow-auto whitespace-pre-wrap break-all font-mono text-xs">{d.payload}</pre>
                        {d.payloadBytes > d.payload.length && <span className="text-ink-muted">first part of {d.payloadBytes} bytes</span>}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {page.data.deadLetters.length === 0 && <p className="p-4 text-ink-muted">None for these filters.</p>}
            </div>
          </Panel>
          <Panel title="Conflicts" actions={<CsvLink href={deadLettersCsvUrl(q, 'conflicts')} label="Download conflicts as CSV" />}>
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <thead><tr className="border-b border-line"><th className="p-2">Received</th><th className="p-2">Probe</th><th className="p-2">Reading time</th><th className="p-2">Stored</th><th className="p-2">Arrived</th><th className="p-2">From</th></tr></thead>
                <tbody>
                  {page.data.conflicts.map((c) => (
                    <tr key={c.id} className="border-b border-line">
                      <td className="p-2 whitespace-nowrap">{c.receivedAt.replace('T', ' ').slice(0, 19)} UTC</td>
                      <td className="p-2 font-mono">{c.probeTag ?? '—'}</td>
                      <td className="p-2 whitespace-nowrap">{c.ts.replace('T', ' ').slice(0, 23)} UTC</td>
                      <td className="p-2">{c.storedOrpMv} mV, {c.storedTempC} °C</td>
                      <td className="p-2">{c.incomingOrpMv} mV, {c.incomingTempC} °C{c.incomingSeq !== null ? ` (seq ${c.incomingSeq})` : ''}</td>
                      <td className="p-2">{c.source}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              {page.data.conflicts.length === 0 && <p className="p-4 text-ink-muted">None for these filters.</p>}
            </div>
          </Panel>
        </>
      )}
    </div>
  );
}
