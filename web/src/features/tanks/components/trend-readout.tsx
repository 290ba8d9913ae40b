import type { TrendResponse } from '@shared/schemas/plant';
import type { ChartTrend } from '../utils/trend-gaps';
import { Quantity } from '../../../components/ui/quantity';
import { formatDateTime, formatMv, formatRatio, formatTempC } from '../../../lib/format';

const RESOLUTION: Record<TrendResponse['resolution'], string> = {
  raw: 'every reading',
  '1m': '1 min buckets (geometric mean)',
  '1h': '1 h buckets (geometric mean)',
};

/** Values under the cursor (or the newest point), and how to read the charts. */
export function TrendReadout({
  trend,
  factors,
  idx,
  timeZone,
  zoomed,
}: {
  trend: ChartTrend;
  factors: Array<number | null>;
  idx: number | null;
  timeZone: string;
  zoomed: boolean;
}) {
  const i = idx ?? trend.t.length - 1;
  const has = i >= 0 && i < trend.t.length;
  const f = has ? factors[i] : null;
  return (
    <div className="flex flex-wrap items-baseline gap-x-5 gap-y-1 text-sm" aria-live="off">
      {has && trend.ratio[i] == null ? (
        <span className="text-ink-muted">No readings here: a gap in the data (the line breaks where readings stopped)</span>
      ) : has ? (
        <>
          <span className="text-ink-muted">{idx == null ? 'Newest' : 'At'} {formatDateTime(trend.t[i] * 1000, timeZone)}</span>
          <span>
            Ratio <Quantity value={formatRatio(trend.ratio[i])} />
            {f && <span className="text-ink-muted"> (×/÷ {f.toFixed(2)})</span>}
          </span>
          <span>
            ORP <Quantity value={formatMv(trend.orpMv[i])} unit="mV" />
          </span>
          <span>
            Temp <Quantity value={formatTempC(trend.tempC[i])} unit="°C" />
          </span>
        </>
      ) : (
        <span className="text-ink-muted">No values</span>
      )}
      <span className="ml-auto text-ink-muted">
        Shown: {RESOLUTION[trend.resolution]}; a break in the line: no readings. {zoomed ? 'Double-click to reset zoom.' : 'Drag to zoom.'}
      </span>
    </div>
  );
}
