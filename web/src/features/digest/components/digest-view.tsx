import { Link } from 'react-router-dom';
import type { DigestTableName } from '@shared/schemas/digest';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { Notice } from '../../../components/ui/notice';
import { formatDateTime, formatUtcOffset } from '../../../lib/format';
import { digestCsvUrl, useDigest } from '../api/get-digest';
import { useDigestParams } from '../hooks/use-digest-params';
import { AlarmSection } from './alarm-section';
import { formatRange } from './digest-format';
import { EventSection } from './event-section';
import { LogSection } from './log-section';
import { PrintSetup } from './print-setup';
import { ShiftPicker } from './shift-picker';
import { TankSection } from './tank-section';
import './digest-print.css';

/** The Shift digest: one shift (by default the last one handed over) or whole days, on screen and on paper. */
export function DigestView() {
  const [params, setParams] = useDigestParams();
  const digest = useDigest(params);

  if (digest.isPending) return <Loading label="Putting the digest together…" />;
  if (digest.isError) {
    return <ErrorState title="The digest could not be made" detail={digest.error.message} onRetry={() => setParams({})} />;
  }
  const d = digest.data;
  const tz = d.site.timeZone;
  const fromMs = Date.parse(d.from);
  const toMs = Date.parse(d.to);
  const csv = (table: DigestTableName) => digestCsvUrl(d, params, table);
  const running = d.shift && d.shift.status !== 'closed';

  return (
    <div data-print-root className="mx-auto flex max-w-7xl flex-col gap-4" data-testid="shift-digest">
      <div className="flex flex-wrap items-start justify-between gap-3">
        <div>
          <h1 className="text-2xl font-bold">Shift digest · {d.site.name}</h1>
          <p className="text-lg tabular-nums">
            {formatRange(d.from, d.to, tz)} <span className="text-ink-muted">site time ({formatUtcOffset(fromMs, tz)})</span>
          </p>
          {d.shift?.status === 'closed' && d.shift.closedBy && (
            <p className="text-sm text-ink-muted">Handed over by {d.shift.closedBy.name} at {formatDateTime(d.shift.closedAt!, tz)}</p>
          )}
        </div>
        <div className="flex flex-col items-end gap-2">
          <PrintSetup />
          <Link to="/readings" className="text-sm text-info-ink underline print:hidden">Readings in and out</Link>
        </div>
      </div>
      <ShiftPicker timeZone={tz} value={params} onChange={setParams} />
      {running && <Notice tone="info">This shift is still running: figures go up to {formatDateTime(d.to, tz)}.</Notice>}
      {digest.isPlaceholderData && <Notice className="print:hidden">Loading the period you chose…</Notice>}
      <TankSection tanks={d.tanks} fromMs={fromMs} toMs={toMs} csvHref={csv('tanks')} />
      <AlarmSection alarms={d.alarms} fromMs={fromMs} toMs={toMs} timeZone={tz} csvHref={csv('alarms')} />
      <LogSection entries={d.log} shift={d.shift} timeZone={tz} csvHref={csv('shift-log')} />
      <div className="grid gap-4 lg:grid-cols-2 print:grid-cols-1">
        <EventSection title="Band changes" section={d.bandChanges} csvHref={csv('band-changes')} empty="No band changes." timeZone={tz} />
        <EventSection title="Calibrations" section={d.calibrations} csvHref={csv('calibrations')} empty="No calibrations." timeZone={tz} />
        <EventSection title="Assays" section={d.assays} csvHref={csv('assays')} empty="No assays sampled." timeZone={tz} />
        <EventSection title="Probe checks" section={d.probeChecks} csvHref={csv('probe-checks')} empty="No probe checks." timeZone={tz} />
      </div>
      <p className="text-xs text-ink-muted">
        From 1-minute rollups: a minute counts by its geometric-mean ratio against the band in force then; minutes without readings count as no data.
        Made in {d.computedMs} ms.
      </p>
    </div>
  );
}
