import { useNow } from '../../lib/clock';
import { formatClock, formatUtcOffset } from '../../lib/format';

/** The site's own time (alarms, shifts and logs are read in it), with its UTC offset. */
export function SiteClock({ siteName, timeZone }: { siteName: string; timeZone: string }) {
  const now = useNow();
  return (
    <div className="hidden flex-col items-end leading-tight md:flex">
      <span className="text-lg font-semibold tabular-nums" aria-label={`Site time ${formatClock(now, timeZone)}`}>
        {formatClock(now, timeZone)}
      </span>
      <span className="text-xs text-ink-muted">
        {siteName} · {formatUtcOffset(now, timeZone)}
      </span>
    </div>
  );
}
