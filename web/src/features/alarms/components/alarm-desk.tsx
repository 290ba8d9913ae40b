import type { ReactNode } from 'react';
import { useSearchParams } from 'react-router-dom';
import type { AlarmState } from '@shared/alarms/states';
import { ActiveAlarms } from './active-alarms';
import { AlarmDetail } from './alarm-detail';
import { AlarmFiguresPanel } from './alarm-figures-panel';
import { AlarmHistory } from './alarm-history';
import { DefinitionsView } from './definitions-view';
import type { DeskContext, DeskFilters } from './desk-types';

const VIEWS = [
  { id: 'active', label: 'Open alarms' }, { id: 'history', label: 'History' }, { id: 'figures', label: 'Alarm-rate figures' },
  { id: 'definitions', label: 'Alarm definitions' },
] as const;
type View = (typeof VIEWS)[number]['id'];
const FILTER_KEYS = ['site', 'circuit', 'tank', 'priority', 'state'] as const;

/**
 * The Alarm desk: open alarms, history and figures, with the selected alarm's detail beside
 * them, and the alarm definitions. View, filters and selection live in the address, so a link (from a mail, the banner or
 * a tile) opens the desk exactly there. `aside` is what the route adds (who is on call now).
 */
export function AlarmDesk({ aside, ...ctx }: DeskContext & { aside?: ReactNode }) {
  const [params, setParams] = useSearchParams();
  const view: View = (VIEWS.find((v) => v.id === params.get('view'))?.id ?? 'active');
  const selected = Number(params.get('alarm')) || null;
  const filters: DeskFilters = {
    site: params.get('site') ?? undefined,
    circuit: Number(params.get('circuit')) || undefined,
    tank: Number(params.get('tank')) || undefined,
    priority: Number(params.get('priority')) || undefined,
    state: (params.get('state') as AlarmState | null) ?? undefined,
  };
  const update = (change: Record<string, string | number | undefined | null>) => {
    const next = new URLSearchParams(params);
    for (const [k, v] of Object.entries(change)) {
      if (v === undefined || v === null || v === '') next.delete(k);
      else next.set(k, String(v));
    }
    setParams(next, { replace: true });
  };
  const select = (id: number | null) => update({ alarm: id });

  return (
    <div className="mx-auto flex max-w-[120rem] flex-col gap-3">
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl font-bold">Alarm desk</h1>
        <div role="tablist" aria-label="Alarm desk views" className="flex flex-wrap gap-1">
          {VIEWS.map((v) => (
            <button key={v.id} role="tab" type="button" aria-selected={view === v.id} onClick={() => update({ view: v.id === 'active' ? null : v.id })}
              className={`rounded-md px-3 py-1.5 text-sm font-semibold ${view === v.id ? 'bg-panel-2 text-ink shadow-[inset_0_-3px_0_var(--fs-ink)]' : 'text-ink-muted hover:text-ink'}`}>
              {v.label}
            </button>
          ))}
        </div>
        <div className="ml-auto">{aside}</div>
      </div>
      <div className={`grid gap-4 ${selected ? 'xl:grid-cols-[minmax(0,3fr)_minmax(24rem,2fr)]' : ''}`}>
        <div className="min-w-0 rounded-lg border border-line bg-panel p-4">
          {view === 'active' && (
            <ActiveAlarms {...ctx} filters={filters} selectedId={selected} onSelect={select}
              onFilters={(f) => update(Object.fromEntries(FILTER_KEYS.map((k) => [k, f[k]])))} />
          )}
          {view === 'history' && <AlarmHistory {...ctx} selectedId={selected} onSelect={select} />}
          {view === 'figures' && <AlarmFiguresPanel timeZone={ctx.timeZone} />}
          {view === 'definitions' && <DefinitionsView {...ctx} tankId={filters.tank} onTank={(tank) => update({ tank })} />}
        </div>
        {selected && (
          <div className="order-first min-w-0 xl:order-none">
            <AlarmDetail key={selected} id={selected} role={ctx.role} timeZone={ctx.timeZone} places={ctx.places} onClose={() => select(null)} />
          </div>
        )}
      </div>
    </div>
  );
}
