import { useState } from 'react';
import type { AuditEntryView, AuditQuery } from '@shared/schemas/audit';
import { SelectField, TextField } from '../../../components/ui/field';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { CsvLink } from '../../../components/ui/csv-link';
import { Panel } from '../../../components/ui/panel';
import { formMessage } from '../../../lib/form';
import { formatDateTime } from '../../../lib/format';
import { auditTrailCsvUrl, useAuditTrail } from '../api/get-audit-trail';
import { useUsers } from '../api/get-users';

type Filters = { entity: string; action: string; userId: string; from: string; to: string };
const EMPTY: Filters = { entity: '', action: '', userId: '', from: '', to: '' };

function toQuery(f: Filters): Partial<AuditQuery> {
  const iso = (v: string) => (v && !Number.isNaN(Date.parse(v)) ? new Date(v).toISOString() : undefined);
  return { entity: f.entity || undefined, action: f.action.trim() || undefined, userId: f.userId ? Number(f.userId) : undefined, from: iso(f.from), to: iso(f.to) };
}

const show = (v: unknown) => (v === undefined || v === null ? '—' : typeof v === 'string' ? v : JSON.stringify(v));

/** What changed, as "field: before → after" for records, or the recorded value otherwise. Text only, never markup. */
function changeLines(e: AuditEntryView): string[] {
  const obj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
  const [b, a] = [e.before, e.after];
  if (obj(b) && obj(a)) {
    const keys = [...new Set([...Object.keys(b), ...Object.keys(a)])];
    return keys.filter((k) => JSON.stringify(b[k]) !== JSON.stringify(a[k])).map((k) => `${k}: ${show(b[k])} → ${show(a[k])}`);
  }
  // A new record (or a removed one): its fields as recorded.
  const only = b == null ? a : a == null ? b : undefined;
  if (obj(only)) return Object.entries(only).map(([k, v]) => `${k}: ${show(v)}`);
  if (e.before == null && e.after == null) return [];
  return [e.before == null ? show(e.after) : `${show(e.before)} → ${show(e.after)}`];
}

/** The audit trail: who changed what and when, before and after, and why; newest first. */
export function AuditTrailPanel({ timeZone }: { timeZone: string }) {
  const [filters, setFilters] = useState<Filters>(EMPTY);
  const q = toQuery(filters);
  const page = useAuditTrail(q);
  const users = useUsers();
  const set = (k: keyof Filters) => (e: { target: { value: string } }) => setFilters((f) => ({ ...f, [k]: e.target.value }));

  return (
    <div className="flex flex-col gap-4">
      <Panel title="Filters" actions={<CsvLink href={auditTrailCsvUrl(q)} />}>
        <div className="grid gap-3 sm:grid-cols-3 lg:grid-cols-5">
          <SelectField label="What" value={filters.entity} onChange={set('entity')}
            options={[{ value: '', label: 'All' }, ...(page.data?.entities ?? []).map((e) => ({ value: e, label: e.replace(/[_-]/g, ' ') }))]} />
          <TextField label="Action" hint="e.g. user or user.update" value={filters.action} onChange={set('action')} autoComplete="off" maxLength={60} />
          <SelectField label="Who" value={filters.userId} onChange={set('userId')}
            options={[{ value: '', label: 'Everyone' }, ...(users.data ?? []).map((u) => ({ value: String(u.id), label: u.name }))]} />
          <TextField label="From" type="datetime-local" value={filters.from} onChange={set('from')} />
          <TextField label="To" type="datetime-local" value={filters.to} onChange={set('to')} />
        </div>
      </Panel>
      {page.isPending ? <Loading label="Loading the audit trail…" /> : page.isError ? <ErrorState title="Could not load" detail={formMessage(page.error) ?? ''} /> : (
        <Panel title="Audit trail">
          <p data-testid="audit-count" className="mb-2 text-sm">
            <strong>{page.data.total}</strong> entries{page.data.total > page.data.entries.length && `, the newest ${page.data.entries.length} shown (the CSV has them all)`}
          </p>
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <thead><tr className="border-b border-line"><th className="p-2">When</th><th className="p-2">Who</th><th className="p-2">Action</th><th className="p-2">Changed</th><th className="p-2">Reason</th></tr></thead>
              <tbody>
                {page.data.entries.map((e) => (
                  <tr key={e.id} className="border-b border-line align-top">
                    <td className="p-2 whitespace-nowrap tabular-nums">{formatDateTime(e.at, timeZone)}</td>
                    <td className="p-2">{e.user ? e.user.name : 'Ferrisight'}</td>
                    <td className="p-2"><span className="font-mono">{e.action}</span><br /><span className="text-ink-muted">{e.entity} {e.entityId ?? ''}</span></td>
                    <td className="p-2"><ul className="max-w-md break-words">{changeLines(e).map((l, i) => <li key={i}>{l}</li>)}</ul></td>
                    <td className="p-2 whitespace-pre-wrap">{e.reason ?? '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            {page.data.entries.length === 0 && <p className="p-4 text-ink-muted">None for these filters.</p>}
          </div>
        </Panel>
      )}
    </div>
  );
}
