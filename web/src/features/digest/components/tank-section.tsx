import type { TankDigest } from '@shared/schemas/digest';
import { Quantity } from '../../../components/ui/quantity';
import { formatMv, formatRatio, formatTempC } from '../../../lib/format';
import { FILL, Swatch } from './band-patterns';
import { formatMinutes, formatPercent } from './digest-format';
import { DigestTable, type Column } from './digest-table';
import { RatioSparkline } from './ratio-sparkline';
import { TimeInBandBar } from './time-in-band-bar';

type Props = { tanks: TankDigest[]; fromMs: number; toMs: number; csvHref: string };

const share = (k: 'inBand' | 'above' | 'below' | 'noData'): Column<TankDigest> => ({
  header: { inBand: 'In band', above: 'Above', below: 'Below', noData: 'No data' }[k],
  numeric: true,
  cell: (t) => (
    <>
      <Quantity value={formatPercent(t.minutes[k], t.minutes.total)} unit="%" />
      <div className="text-xs text-ink-muted">{formatMinutes(t.minutes[k])}</div>
    </>
  ),
});

const stat = (header: string, key: 'ratio' | 'orpMv' | 'tempC', unit: string, fmt: (v: number) => string): Column<TankDigest> => ({
  header, numeric: true,
  cell: (t) => (t[key] ? (
    <>
      <Quantity value={fmt(t[key]!.mean)} unit={unit} />
      <div className="text-xs text-ink-muted">{fmt(t[key]!.min)} to {fmt(t[key]!.max)}</div>
    </>
  ) : '—'),
});

const COLUMNS: Column<TankDigest>[] = [
  { header: 'Tank', cell: (t) => <span className="font-semibold">{t.tag}</span> },
  { header: 'Band', cell: (t) => <span className="whitespace-nowrap">{t.bands.map((b) => `${formatRatio(b.low)}–${formatRatio(b.high)}`).join(' → ')}</span> },
  share('inBand'), share('above'), share('below'), share('noData'),
  stat('Ratio (geo. mean)', 'ratio', '', formatRatio),
  stat('ORP', 'orpMv', 'mV', formatMv),
  stat('Temperature', 'tempC', '°C', formatTempC),
];

/** Time in band per tank as bars and sparklines (what people look at), then the figures (what they quote). */
export function TankSection({ tanks, fromMs, toMs, csvHref }: Props) {
  return (
    <DigestTable title="Tanks: time in band" csvHref={csvHref} columns={COLUMNS} rows={tanks} empty="No tanks on this site.">
      <div className="flex flex-wrap gap-4">
        <Swatch fill={FILL.below} label="below band" />
        <Swatch fill={FILL.inBand} label="in band" />
        <Swatch fill={FILL.above} label="above band" />
        <Swatch fill={FILL.noData} label="no data (gaps are never counted in band)" />
      </div>
      <div className="grid grid-cols-[3.5rem_minmax(8rem,1fr)_4.5rem_minmax(8rem,1fr)] items-center gap-x-3 gap-y-1.5" data-testid="time-in-band">
        {tanks.map((t) => (
          <div key={t.tankId} className="contents">
            <span className="font-bold">{t.tag}</span>
            <TimeInBandBar tag={t.tag} minutes={t.minutes} />
            <span className="text-right text-sm tabular-nums">{formatPercent(t.minutes.inBand, t.minutes.total)}% in</span>
            <RatioSparkline tank={t} fromMs={fromMs} toMs={toMs} />
          </div>
        ))}
      </div>
    </DigestTable>
  );
}
