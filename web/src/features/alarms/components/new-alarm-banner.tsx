import { Link } from 'react-router-dom';
import { KIND_INFO } from '@shared/alarms/kinds';
import { PriorityPill } from '../../../components/ui/priority-pill';
import { useActiveAlarms } from '../api/get-active-alarms';
import { useAlarmAnnouncer } from '../hooks/use-alarm-announcer';

/**
 * A new P1 alarm announces itself on every screen: a banner under the header (and a tone,
 * see use-alarm-sound). It goes away when dismissed or once the alarm is acknowledged.
 */
export function NewAlarmBanner({ deskPath }: { deskPath: string }) {
  const { fresh, dismiss } = useAlarmAnnouncer();
  const open = useActiveAlarms().data?.alarms;
  // A plant-wide alarm has its own banner that stays (plant-alarm-banner.tsx).
  const waiting = fresh.filter((e) => e.tankId !== null && (open?.some((a) => a.id === e.instanceId && a.state === 'unacknowledged') ?? true));
  if (waiting.length === 0) return null;
  return (
    <div role="alert" className="flex flex-col gap-1 border-b-2 border-attention-1 bg-attention-1-soft px-3 py-2" data-testid="new-alarm-banner">
      {waiting.map((e) => (
        <div key={e.instanceId} className="flex items-center gap-3">
          <PriorityPill priority={1} pulse />
          <span className="font-bold text-attention-1-ink">New alarm</span>
          <span className="truncate">
            <span className="font-bold">{e.tankTag ?? 'Plant'}</span> · {KIND_INFO[e.alarmKind].label}
          </span>
          <Link to={`${deskPath}?alarm=${e.instanceId}`} className="ml-auto font-semibold text-info-ink underline" onClick={() => dismiss(e.instanceId)}>
            Open on the Alarm desk
          </Link>
          <button type="button" className="rounded px-2 text-sm text-ink-muted hover:text-ink" onClick={() => dismiss(e.instanceId)}>
            Dismiss
          </button>
        </div>
      ))}
    </div>
  );
}
