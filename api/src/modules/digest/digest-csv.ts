import type { AlarmSpan, DigestEvent, DigestResponse, DigestTableName, Stat, TankDigest } from '../../../../shared/schemas/digest.ts';
import type { ShiftLogEntryView } from '../../../../shared/schemas/shifts.ts';

type Cell = string | number | null;
type Table<T> = { columns: Array<[string, (row: T) => Cell]>; rows: (d: DigestResponse) => T[] };
type Rows = (d: DigestResponse) => Cell[][];

/** Header first, then one line per row. */
const rowsOf = <T>(t: Table<T>): Rows => (d) => [t.columns.map(([h]) => h), ...t.rows(d).map((row) => t.columns.map(([, v]) => v(row)))];

const share = (k: 'inBand' | 'above' | 'below' | 'noData'): Array<[string, (t: TankDigest) => Cell]> => {
  const name = { inBand: 'in_band', above: 'above', below: 'below', noData: 'no_data' }[k];
  return [
    [`${name}_min`, (t) => t.minutes[k]],
    [`${name}_pct`, (t) => (t.minutes.total ? Number(((t.minutes[k] / t.minutes.total) * 100).toFixed(2)) : null)],
  ];
};

/** ratio_geomean_fe3_fe2, orp_min_mv, …: the mean of a ratio is its geometric mean. */
const stat = (key: 'ratio' | 'orpMv' | 'tempC', base: string): Array<[string, (t: TankDigest) => Cell]> =>
  (['mean', 'min', 'max'] as const).map((m) => [
    base.replace('{m}', key === 'ratio' && m === 'mean' ? 'geomean' : m), (t) => (t[key] as Stat | null)?.[m] ?? null,
  ]);

const tanks: Table<TankDigest> = {
  columns: [
    ['tank', (t) => t.tag], ['tank_name', (t) => t.name], ['circuit', (t) => t.circuitTag],
    ['band_fe3_fe2', (t) => t.bands.map((b) => `${b.low}-${b.high}`).join(' then ')],
    ...share('inBand'), ...share('above'), ...share('below'), ...share('noData'),
    ...stat('ratio', 'ratio_{m}_fe3_fe2'), ...stat('orpMv', 'orp_{m}_mv'), ...stat('tempC', 'temp_{m}_c'),
  ],
  rows: (d) => d.tanks,
};

const ackS = (a: AlarmSpan) => (a.acknowledgedAt ? (Date.parse(a.acknowledgedAt) - Date.parse(a.raisedAt)) / 1000 : null);
const alarms: Table<AlarmSpan> = {
  columns: [
    ['priority', (a) => a.priority], ['tank', (a) => a.tankTag], ['alarm', (a) => a.kind], ['raised_utc', (a) => a.raisedAt],
    ['acknowledged_utc', (a) => a.acknowledgedAt], ['time_to_acknowledge_s', ackS], ['shelved_utc', (a) => a.shelvedAt], ['cleared_utc', (a) => a.clearedAt],
  ],
  rows: (d) => d.alarms.timeline,
};

const log: Table<ShiftLogEntryView> = {
  columns: [
    ['at_utc', (e) => e.at], ['author', (e) => e.author.name], ['tank', (e) => e.tank?.tag ?? null], ['alarm_id', (e) => e.alarmId],
    ['entry', (e) => e.body], ['corrects_entry', (e) => e.correctsId], ['entry_id', (e) => e.id],
  ],
  rows: (d) => d.log,
};

const events = (section: 'bandChanges' | 'calibrations' | 'assays' | 'probeChecks'): Table<DigestEvent> => ({
  columns: [['at_utc', (e) => e.at], ['tank', (e) => e.tankTag], ['what', (e) => e.summary], ['by', (e) => e.by]],
  rows: (d) => d[section].items,
});

const TABLES: Record<DigestTableName, Rows> = {
  tanks: rowsOf(tanks), alarms: rowsOf(alarms), 'shift-log': rowsOf(log),
  'band-changes': rowsOf(events('bandChanges')), calibrations: rowsOf(events('calibrations')),
  assays: rowsOf(events('assays')), 'probe-checks': rowsOf(events('probeChecks')),
};

/** One digest table as CSV rows, header first (written by the one CSV writer, which escapes formulas). */
export const digestTableRows = (d: DigestResponse, table: DigestTableName): Cell[][] => TABLES[table](d);

/** 'shift-digest-kestrel-20261204T0600Z-tanks.csv': site, start of the period (UTC) and table. */
export function digestFileName(d: DigestResponse, table: DigestTableName): string {
  const start = d.from.slice(0, 16).replace(/[-:]/g, '');
  return `shift-digest-${d.site.tag.replace(/[^A-Za-z0-9_-]+/g, '_')}-${start}Z-${table}.csv`;
}
