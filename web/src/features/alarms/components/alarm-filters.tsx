import { ALARM_STATES, type AlarmState } from '@shared/alarms/states';
import { SelectField } from '../../../components/ui/field';
import { STATE_LABEL } from './alarm-states';
import type { DeskFilters, Place } from './desk-types';

const ANY = { value: '', label: 'All' };
const unique = <T,>(list: T[], key: (x: T) => string | number) => [...new Map(list.map((x) => [key(x), x])).values()];

/** Site, circuit, tank, priority and state; narrowing a site or circuit narrows the choices below it. */
export function AlarmFilters({ filters, places, onChange }: { filters: DeskFilters; places: Place[]; onChange: (f: DeskFilters) => void }) {
  const inSite = places.filter((p) => !filters.site || p.siteTag === filters.site);
  const inCircuit = inSite.filter((p) => !filters.circuit || p.circuitId === filters.circuit);
  const num = (v: string) => (v ? Number(v) : undefined);
  return (
    <div className="grid grid-cols-2 gap-3 sm:grid-cols-5" role="group" aria-label="Filters">
      <SelectField label="Site" value={filters.site ?? ''} onChange={(e) => onChange({ ...filters, site: e.target.value || undefined, circuit: undefined, tank: undefined })}
        options={[ANY, ...unique(places, (p) => p.siteTag).map((p) => ({ value: p.siteTag, label: p.siteName }))]} />
      <SelectField label="Circuit" value={filters.circuit ?? ''} onChange={(e) => onChange({ ...filters, circuit: num(e.target.value), tank: undefined })}
        options={[ANY, ...unique(inSite, (p) => p.circuitId).map((p) => ({ value: String(p.circuitId), label: p.circuitName }))]} />
      <SelectField label="Tank" value={filters.tank ?? ''} onChange={(e) => onChange({ ...filters, tank: num(e.target.value) })}
        options={[ANY, ...inCircuit.map((p) => ({ value: String(p.tankId), label: p.tankTag }))]} />
      <SelectField label="Priority" value={filters.priority ?? ''} onChange={(e) => onChange({ ...filters, priority: num(e.target.value) })}
        options={[ANY, { value: '1', label: 'P1 high' }, { value: '2', label: 'P2 medium' }, { value: '3', label: 'P3 low' }]} />
      <SelectField label="State" value={filters.state ?? ''} onChange={(e) => onChange({ ...filters, state: (e.target.value || undefined) as AlarmState | undefined })}
        options={[ANY, ...ALARM_STATES.filter((s) => s !== 'normal').map((s) => ({ value: s, label: STATE_LABEL[s] }))]} />
    </div>
  );
}
