import { Link } from 'react-router-dom';
import { formatAge, formatDuration } from '../../../lib/format';
import type { IngestAlarmView, WorkerBeatView } from '../api/get-ingest-health';

const STATE_TEXT: Record<string, string> = {
  unacknowledged: 'unacknowledged', acknowledged: 'acknowledged', 'rtn-unacknowledged': 'back to normal, unacknowledged',
  shelved: 'shelved', 'out-of-service': 'out of service', suppressed: 'suppressed',
};

/** Each worker's heartbeat and the plant-wide "ingest stopped" alarm, linked to the Alarm desk. */
export function IngestWatch({ workers, alarm, deskPath }: { workers: WorkerBeatView[]; alarm: IngestAlarmView | null; deskPath: string }) {
  const open = alarm?.instanceId != null;
  return (
    <div className="mt-3 flex flex-col gap-1 text-sm" data-testid="ingest-watch">
      <p className={open && alarm.conditionActive ? 'font-semibold text-attention-1-ink' : 'text-ink-muted'}>
        {open ? (
          <>
            Alarm “Ingest stopped: readings are not being stored” is {alarm.conditionActive ? 'active' : 'over'}, {STATE_TEXT[alarm.state ?? ''] ?? alarm.state}.{' '}
            <Link to={`${deskPath}?alarm=${alarm.instanceId}`} className="text-info-ink underline" data-testid="ingest-alarm-link">Open it on the Alarm desk</Link>
          </>
        ) : (
          'No "ingest stopped" alarm is open.'
        )}
      </p>
      {workers.length > 0 && (
        <ul className="flex flex-col gap-0.5 text-ink-muted">
          {workers.map((w) => (
            <li key={w.worker} className="break-words">
              <span className="font-semibold text-ink">{w.worker}</span>{' '}
              {w.stopped ? 'stopped on purpose' : `heartbeat ${formatAge(w.beatAgeMs / 1000)}, running for ${formatDuration(w.upMs / 1000)}`}
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
