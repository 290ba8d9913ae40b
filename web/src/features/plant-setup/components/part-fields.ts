import { REFERENCE_ELECTRODES } from '@shared/redox';
import {
  CIRCUIT_PROCESSES, CIRCUIT_PROCESS_LABELS, CUSTOM_REFERENCE, STARTING_FORMAL_POTENTIAL, type SetupCircuit, type SetupGateway, type SetupProbe,
  type SetupSite, type SetupTank,
} from '@shared/schemas/plant-setup';
import type { FieldSpec } from './part-form';

const tag = (what: string): FieldSpec => ({ name: 'tag', label: `${what} tag`, hint: 'Letters, digits, _ . - ; used in MQTT topics, cannot be changed later' });
const name: FieldSpec = { name: 'name', label: 'Name' };

export const SITE_FIELDS = (creating: boolean): FieldSpec[] => [
  ...(creating ? [tag('Site')] : []),
  name,
  { name: 'timeZone', label: 'Time zone', hint: 'IANA name, e.g. Australia/Perth or UTC; times on screen are shown in it' },
];
export const siteValues = (s?: SetupSite) => ({ tag: s?.tag ?? '', name: s?.name ?? '', timeZone: s?.timeZone ?? 'UTC' });

export const CIRCUIT_FIELDS = (creating: boolean): FieldSpec[] => [
  ...(creating ? [{ ...tag('Circuit'), hint: 'Short label, unique within the site' }] : []),
  name,
  { name: 'process', label: 'Process', type: 'select', options: CIRCUIT_PROCESSES.map((k) => ({ value: k, label: CIRCUIT_PROCESS_LABELS[k] })), hint: 'Bioleach circuits are dosed with air or oxygen, not peroxide (common practice)' },
  { name: 'position', label: 'Order on the Floor', type: 'number', hint: 'Counted from 1, top row first' },
];
export const circuitValues = (c?: SetupCircuit, next = 1) => ({
  tag: c?.tag ?? '', name: c?.name ?? '', process: c?.process ?? 'ferric-leach', position: String(c?.position ?? next),
});

export const TANK_FIELDS = (creating: boolean): FieldSpec[] => [
  ...(creating ? [tag('Tank')] : []),
  name,
  { name: 'position', label: 'Position in the circuit', type: 'number', hint: 'Counted from 1, as the slurry flows' },
  { name: 'volumeM3', label: 'Working volume', type: 'number', unit: 'm³' },
  { name: 'feTotalGPerL', label: 'Usual total iron (optional)', type: 'number', unit: 'g/L' },
  ...(creating
    ? [
        { name: 'bandLow', label: 'Ratio band low', type: 'number', hint: 'Fe³⁺/Fe²⁺; metallurgists refine it on the Bands screen' } as FieldSpec,
        { name: 'bandHigh', label: 'Ratio band high', type: 'number' } as FieldSpec,
        { name: 'formalPotentialV', label: 'Starting formal potential', type: 'number', unit: 'V', hint: `vs SHE. ${STARTING_FORMAL_POTENTIAL.source}` } as FieldSpec,
      ]
    : []),
];
export const tankValues = (t?: SetupTank, next = 1) => ({
  tag: t?.tag ?? '', name: t?.name ?? '', position: String(t?.position ?? next), volumeM3: t ? String(t.volumeM3) : '',
  feTotalGPerL: t?.feTotalGPerL == null ? '' : String(t.feTotalGPerL), bandLow: '', bandHigh: '', formalPotentialV: String(STARTING_FORMAL_POTENTIAL.valueV),
});

const isCustom = (v: Record<string, string>) => v.referenceId === CUSTOM_REFERENCE;
export const PROBE_FIELDS = (creating: boolean): FieldSpec[] => [
  ...(creating ? [{ ...tag('Probe'), hint: 'As the gateway names it in the topic ferrisight/v1/<site>/<probe>/reading' }] : []),
  {
    name: 'referenceId', label: 'Reference electrode', type: 'select',
    options: [...REFERENCE_ELECTRODES.map((r) => ({ value: r.id, label: r.label })), { value: CUSTOM_REFERENCE, label: 'Custom (maker’s values)' }],
  },
  { name: 'referenceE25V', label: 'Reference potential at 25 °C', type: 'number', unit: 'V', hint: 'vs SHE, from the probe maker', when: isCustom },
  { name: 'referenceCoeffVPerK', label: 'Reference temperature coefficient', type: 'number', unit: 'V/K', when: isCustom },
  { name: 'toleranceMv', label: 'Check tolerance', type: 'number', unit: 'mV' },
  { name: 'intervalS', label: 'Reporting interval', type: 'number', unit: 's' },
  ...(creating ? [{ name: 'installedAt', label: 'Installed', type: 'datetime-local' } as FieldSpec] : []),
];
export const probeValues = (p?: SetupProbe) => ({
  tag: p?.tag ?? '', referenceId: p?.referenceId ?? 'agcl-sat',
  referenceE25V: p ? String(p.referenceE25V) : '', referenceCoeffVPerK: p ? String(p.referenceCoeffVPerK) : '',
  toleranceMv: String(p?.toleranceMv ?? 10), intervalS: String(p?.intervalS ?? 5),
  installedAt: localNow(),
});

export const GATEWAY_FIELDS = (creating: boolean): FieldSpec[] => [
  ...(creating ? [{ name: 'username', label: 'Username', hint: 'The MQTT login; 3–64 letters, digits, _ . -; matched exactly' } as FieldSpec] : []),
  { name: 'name', label: 'Name (optional)', hint: 'Where it is, what it is' },
];
export const gatewayValues = (g?: SetupGateway) => ({ username: g?.username ?? '', name: g?.name ?? '' });

function localNow(): string {
  const d = new Date();
  d.setMinutes(d.getMinutes() - d.getTimezoneOffset());
  return d.toISOString().slice(0, 16);
}
