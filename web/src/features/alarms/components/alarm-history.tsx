import { useState, type FormEvent } from 'react';
import { ALARM_KINDS, KIND_INFO } from '@shared/alarms/kinds';
import { Button } from '../../../components/ui/button';
import { SelectField, TextField } from '../../../components/ui/field';
import { useNow } from '../../../lib/clock';
import { isoToSiteLocal, siteLocalToIso } from '@shared/time/site-time';
import type { HistoryParams } from '../api/alarm-keys';
import { alarmHistoryCsvUrl, HISTORY_PAGE, useAlarmHistory } from '../api/get-alarm-history';
import { AlarmTable } from './alarm-table';
import type { DeskContext } from './desk-types';

type Props = DeskContext & { selectedId: number | null; onSelect: (id: number) => void };

const DEFAULT_SPAN_MS = 7 * 86_400_000;

/** Search past alarm episodes by time (site time), tank, priority, kind and text; export what is found as CSV. */
export function AlarmHistory({ timeZone, places, selectedId, onSelect }: Props) {
  const now = useNow();
  const [form, setForm] = useState(() => ({ from: isoToSiteLocal(now - DEFAULT_SPAN_MS, timeZone), to: isoToSiteLocal(now + 60_000, timeZone), tank: '', priority: '', kind: '', q: '' }));
  // Opens on the last week's alarms, so the tab is never blank.
  const [params, setParams] = useState<HistoryParams | null>(() => ({ from: new Date(now - DEFAULT_SPAN_MS).toISOString(), to: new Date(now + 60_000).toISOString(), offset: 0 }));
  const [bad, setBad] = useState<string | null>(null);
  const q = useAlarmHistory(params);

  const search = (e: FormEvent) => {
    e.preventDefault();
    const from = siteLocalToIso(form.from, timeZone);
    const to = siteLocalToIso(form.to, timeZone);
    if (!from || !to || Date.parse(from) >= Date.parse(to)) return setBad('Give a start before the end');
    setBad(null);
    setParams({ from, to, offset: 0, tank: form.tank ? Number(form.tank) : undefined, priority: form.priority ? Number(form.priority) : undefined, kind: form.kind || undefined, q: form.q || undefined });
  };
  const set = (k: keyof typeof form) => (e: { target: { value: string } }) => setForm({ ...form, [k]: e.target.value });
  const total = q.data?.total ?? 0;
  const offset = params?.offset ?? 0;

  return (
    <div className="flex flex-col gap-3">
      <form onSubmit={search} className="grid grid-cols-2 items-end gap-3 lg:grid-cols-7" aria-label="Search alarm history">
        <TextField label={`From (${timeZone})`} type="datetime-local" value={form.from} onChange={set('from')} error={bad ?? undefined} />
        <TextField label="To" type="datetime-local" value={form.to} onChange={set('to')} />
        <SelectField label="Tank" value={form.tank} onChange={set('tank')} options={[{ value: '', label: 'All' }, ...places.map((p) => ({ value: String(p.tankId), label: p.tankTag }))]} />
        <SelectField label="Priority" value={form.priority} onChange={set('priority')} options={[{ value: '', label: 'All' }, { value: '1', label: 'P1' }, { value: '2', label: 'P2' }, { value: '3', label: 'P3' }]} />
        <SelectField label="Alarm" value={form.kind} onChange={set('kind')} options={[{ value: '', label: 'All' }, ...ALARM_KINDS.map((k) => ({ value: k, label: KIND_INFO[k].label }))]} />
        <TextField label="Text" value={form.q} onChange={set('q')} placeholder="comment, person, reason" />
        <Button type="submit" variant="primary">Search</Button>
      </form>
      {params && q.data && (
        <>
          <div className="flex items-center gap-3 text-sm text-ink-muted">
            <span data-testid="history-total">{total} found</span>
            <a className="ml-auto font-semibold text-info-ink underline" href={alarmHistoryCsvUrl(params)} download>Export CSV</a>
          </div>
          <AlarmTable mode="history" alarms={q.data.alarms} selectedId={selectedId} timeZone={timeZone} canAck={false} onSelect={onSelect} />
          {total > HISTORY_PAGE && (
            <div className="flex justify-end gap-2">
              <Button size="sm" disabled={offset === 0} onClick={() => setParams({ ...params, offset: Math.max(0, offset - HISTORY_PAGE) })}>Newer</Button>
              <Button size="sm" disabled={offset + HISTORY_PAGE >= total} onClick={() => setParams({ ...params, offset: offset + HISTORY_PAGE })}>Older</Button>
            </div>
          )}
        </>
      )}
    </div>
  );
}
