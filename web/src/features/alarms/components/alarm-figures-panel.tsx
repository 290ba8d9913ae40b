import { useMemo, useState, type ReactNode } from 'react';
import { PRIORITY_LABEL } from '@shared/alarms/kinds';
import { sourceNote, type Target } from '@shared/alarms/targets';
import { SelectField } from '../../../components/ui/field';
import { Panel } from '../../../components/ui/panel';
import { Quantity } from '../../../components/ui/quantity';
import { useNow } from '../../../lib/clock';
import { formatDateTime } from '../../../lib/format';
import { useAlarmFigures } from '../api/get-alarm-figures';

const WINDOWS = [{ value: '24', label: 'Last 24 h' }, { value: '168', label: 'Last 7 days' }, { value: '720', label: 'Last 30 days' }];
const n1 = (v: number | null) => (v === null ? '—' : v < 10 ? v.toFixed(1) : String(Math.round(v)));
const pct = (v: number) => `${Math.round(v * 100)} %`;
const dur = (s: number | null) => (s === null ? '—' : s < 90 ? `${Math.round(s)} s` : `${Math.round(s / 60)} min`);

/** A figure beside its target; over target gets a left bar and the word, not only a colour. */
function Figure({ label, value, unit, target, over }: { label: string; value: string; unit?: string; target: string; over: boolean }) {
  return (
    <div className={`rounded-md bg-panel-2 px-3 py-2 ${over ? 'border-l-4 border-attention-2' : ''}`}>
      <dt className="text-xs text-ink-muted">{label}</dt>
      <dd className="text-xl"><Quantity value={value} unit={unit} />{over && <span className="ml-2 text-xs font-semibold text-attention-2-ink">over target</span>}</dd>
      <dd className="text-xs text-ink-muted">{target}</dd>
    </div>
  );
}

const List = ({ title, empty, children }: { title: string; empty: boolean; children: ReactNode }) => (
  <section aria-label={title}><h3 className="mb-1 text-sm font-bold">{title}</h3>{empty ? <p className="text-sm text-ink-muted">None.</p> : <ul className="text-sm">{children}</ul>}</section>
);

/** Alarm-rate figures against their targets, each labelled with its publication or as common practice. */
export function AlarmFiguresPanel({ timeZone }: { timeZone: string }) {
  const [hours, setHours] = useState('24');
  // The window moves on once a minute (a new query key), so the figures stay current on a wall screen.
  const minute = Math.ceil(useNow() / 60_000) * 60_000;
  const range = useMemo(() => ({ from: new Date(minute - Number(hours) * 3_600_000).toISOString(), to: new Date(minute).toISOString() }), [hours, minute]);
  const q = useAlarmFigures(range);
  const t = q.data?.targets;
  const f = q.data?.figures;
  const note = (x: Target) => `(${sourceNote(x)})`;
  return (
    <Panel title="Alarm-rate figures" actions={<div className="w-40"><SelectField label="Window" value={hours} onChange={(e) => setHours(e.target.value)} options={WINDOWS} /></div>}>
      {!f || !t ? <p className="text-ink-muted">{q.isError ? q.error.message : 'Loading…'}</p> : (
        <div className="flex flex-col gap-4" data-testid="alarm-figures">
          <dl className="grid grid-cols-2 gap-3 lg:grid-cols-4">
            <Figure label="Alarms per 10 min, mean" value={n1(f.per10Min.mean)} over={f.per10Min.mean >= t.per10MinAim.value} target={`aim under ${t.per10MinAim.value} ${note(t.per10MinAim)}`} />
            <Figure label="Alarms per 10 min, worst" value={String(f.per10Min.max)} over={f.per10Min.max > t.per10MinManageable.value} target={`manageable ${t.per10MinAim.value}–${t.per10MinManageable.value} ${note(t.per10MinManageable)}`} />
            <Figure label="Alarms per hour, mean" value={n1(f.perHour.mean)} over={f.perHour.mean > t.perHourAcceptable.value} target={`about ${t.perHourAcceptable.value} acceptable ${note(t.perHourAcceptable)}`} />
            <Figure label="Alarms per hour, worst" value={String(f.perHour.max)} over={f.perHour.max > t.perHourMax.value} target={`${t.perHourMax.value} at most ${note(t.perHourMax)}`} />
            <Figure label="Time to acknowledge, mean" value={dur(f.timeToAck.meanS)} over={false} target={`${f.timeToAck.count} acknowledged, ${f.timeToAck.unacknowledged} not yet`} />
            <Figure label="Time to acknowledge, max" value={dur(f.timeToAck.maxS)} over={false} target={`P1 mean ${dur(f.timeToAck.byPriority[1].meanS)}`} />
            <Figure label="Flood periods" value={String(f.floods.length)} over={f.floods.length > 0} target={`over ${t.floodStartPer10Min.value} in 10 min, until under ${t.floodEndPer10Min.value} ${note(t.floodStartPer10Min)}`} />
            <Figure label="Alarms in window" value={String(f.total)} over={false} target={range.from.slice(0, 10) + ' onwards'} />
          </dl>
          <section aria-label="Priority mix">
            <h3 className="mb-1 text-sm font-bold">Priority mix {note(t.mixLow)}</h3>
            <ul className="grid grid-cols-3 gap-2 text-sm">
              {([1, 2, 3] as const).map((p) => (
                <li key={p} className="rounded-md bg-panel-2 px-3 py-1.5">{PRIORITY_LABEL[p]}: <strong>{pct(f.priorityMix[p].share)}</strong> ({f.priorityMix[p].count}), target about {pct(f.priorityMix[p].target)}</li>
              ))}
            </ul>
          </section>
          <div className="grid gap-4 lg:grid-cols-2">
            <List title="Top 10 most frequent" empty={f.top10.length === 0}>
              {f.top10.map((x) => <li key={x.definitionId}>{x.label}: <strong>{x.count}</strong> ({pct(x.share)})</li>)}
            </List>
            <List title={`Chattering: ${t.chatterCount.value}+ in ${t.chatterWindowS.value} s ${note(t.chatterCount)}`} empty={f.chattering.length === 0}>
              {f.chattering.map((x) => <li key={x.definitionId}>{x.label}: {x.worstIn60s} in 60 s, {x.activations} in all</li>)}
            </List>
            <List title={`Stale: active over ${t.staleHours.value} h ${note(t.staleHours)}`} empty={f.stale.length === 0}>
              {f.stale.map((x) => <li key={x.definitionId}>{x.label}: {Math.round(x.hours)} h</li>)}
            </List>
            <List title="Floods" empty={f.floods.length === 0}>
              {f.floods.map((x) => <li key={x.startMs}>{formatDateTime(x.startMs, timeZone)} to {x.endMs ? formatDateTime(x.endMs, timeZone).slice(11) : 'now'}: {x.count} alarms, peak {x.peakPer10Min} in 10 min</li>)}
            </List>
          </div>
        </div>
      )}
    </Panel>
  );
}
