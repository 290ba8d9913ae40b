/**
 * Alarm definition kinds: what each one measures, in which unit, which way it trips and which
 * part of the system evaluates it. Shared so the Alarm desk labels match the engine exactly.
 */
export const TANK_ALARM_KINDS = [
  'ratio-below-band', 'ratio-above-band', 'orp-low', 'orp-high', 'temp-low', 'temp-high', 'orp-rate',
  'stale', 'probe-flatline', 'probe-noisy', 'calibration-drift', 'probe-check-overdue',
] as const;
export type TankAlarmKind = (typeof TANK_ALARM_KINDS)[number];
/**
 * Alarms about Ferrisight itself, one per plant and belonging to no tank: defined by a migration,
 * raised and cleared by the notifier's watch, acknowledged and escalated like any other.
 */
export const PLANT_ALARM_KINDS = ['ingest-stopped'] as const;
export type PlantAlarmKind = (typeof PLANT_ALARM_KINDS)[number];
export const ALARM_KINDS = [...TANK_ALARM_KINDS, ...PLANT_ALARM_KINDS] as const;
export type AlarmKind = (typeof ALARM_KINDS)[number];

/**
 * reading: evaluated as readings arrive (ingest path); timer: evaluated by the engine's tick
 * (no reading arrives when a probe goes quiet); input: a value fed by another feature
 * (assays → calibration drift), picked up by the tick; plant: a plant-wide alarm (no tank).
 */
export type KindSource = 'reading' | 'timer' | 'input' | 'plant';

export type KindInfo = {
  label: string;
  /** 'high' trips above the limit, 'low' below it. */
  direction: 'high' | 'low';
  source: KindSource;
  /** Unit of the measured value and of the threshold. */
  unit: string;
  /** Unit of the deadband; ratio limits use a percentage of the limit (ratio is logarithmic in mV). */
  deadbandUnit: string;
  /** Where the limit comes from: the tank's band (read live) or the definition's threshold. */
  limitFrom: 'band-low' | 'band-high' | 'threshold';
  /** True when the kind needs a window (window_s) of samples. */
  windowed: boolean;
};

export const KIND_INFO: Record<AlarmKind, KindInfo> = {
  'ratio-below-band': { label: 'Fe³⁺/Fe²⁺ ratio below band', direction: 'low', source: 'reading', unit: '', deadbandUnit: '%', limitFrom: 'band-low', windowed: false },
  'ratio-above-band': { label: 'Fe³⁺/Fe²⁺ ratio above band', direction: 'high', source: 'reading', unit: '', deadbandUnit: '%', limitFrom: 'band-high', windowed: false },
  'orp-low': { label: 'ORP low', direction: 'low', source: 'reading', unit: 'mV', deadbandUnit: 'mV', limitFrom: 'threshold', windowed: false },
  'orp-high': { label: 'ORP high', direction: 'high', source: 'reading', unit: 'mV', deadbandUnit: 'mV', limitFrom: 'threshold', windowed: false },
  'temp-low': { label: 'Temperature low', direction: 'low', source: 'reading', unit: '°C', deadbandUnit: '°C', limitFrom: 'threshold', windowed: false },
  'temp-high': { label: 'Temperature high', direction: 'high', source: 'reading', unit: '°C', deadbandUnit: '°C', limitFrom: 'threshold', windowed: false },
  'orp-rate': { label: 'ORP changing fast', direction: 'high', source: 'reading', unit: 'mV/min', deadbandUnit: 'mV/min', limitFrom: 'threshold', windowed: true },
  stale: { label: 'No data from probe', direction: 'high', source: 'timer', unit: '× interval', deadbandUnit: '× interval', limitFrom: 'threshold', windowed: false },
  'probe-flatline': { label: 'Probe flat-lined', direction: 'low', source: 'reading', unit: 'mV spread', deadbandUnit: 'mV', limitFrom: 'threshold', windowed: true },
  'probe-noisy': { label: 'Probe noisy', direction: 'high', source: 'reading', unit: 'mV spread', deadbandUnit: 'mV', limitFrom: 'threshold', windowed: true },
  'calibration-drift': { label: 'Probe disagrees with assay', direction: 'high', source: 'input', unit: 'mV', deadbandUnit: 'mV', limitFrom: 'threshold', windowed: false },
  'probe-check-overdue': { label: 'Probe check overdue', direction: 'high', source: 'timer', unit: 'h past due', deadbandUnit: 'h', limitFrom: 'threshold', windowed: false },
  'ingest-stopped': { label: 'Ingest stopped: readings are not being stored', direction: 'high', source: 'plant', unit: 's', deadbandUnit: 's', limitFrom: 'threshold', windowed: false },
};

export const READING_KINDS = ALARM_KINDS.filter((k) => KIND_INFO[k].source === 'reading');
export const TICK_KINDS = ALARM_KINDS.filter((k) => KIND_INFO[k].source === 'timer' || KIND_INFO[k].source === 'input');
export const isPlantKind = (k: AlarmKind): k is PlantAlarmKind => KIND_INFO[k].source === 'plant';

export const PRIORITIES = [1, 2, 3] as const;
export type Priority = (typeof PRIORITIES)[number];
export const PRIORITY_LABEL: Record<Priority, string> = { 1: 'P1 high', 2: 'P2 medium', 3: 'P3 low' };

/** The limit in force for a definition: band limits are read from the tank each time. */
export function limitFor(kind: AlarmKind, threshold: number | null, band: { low: number; high: number }): number | null {
  const from = KIND_INFO[kind].limitFrom;
  if (from === 'band-low') return band.low;
  if (from === 'band-high') return band.high;
  return threshold;
}
