import { Button } from '../../../components/ui/button';
import { LiveStatusNotice } from '../../../components/ui/live-status-notice';
import { ErrorState, Loading } from '../../../components/ui/page-state';
import { useMediaQuery } from '../../../lib/use-media-query';
import { useAcknowledgeAlarm } from '../api/acknowledge-alarm';
import { useAcknowledgeTank } from '../api/acknowledge-tank';
import { useActiveAlarms } from '../api/get-active-alarms';
import { AlarmFilters } from './alarm-filters';
import { isUnacknowledged } from './alarm-states';
import { AlarmTable, deskOrder } from './alarm-table';
import { ACK_ROLES, type DeskContext, type DeskFilters } from './desk-types';

type Props = DeskContext & { filters: DeskFilters; onFilters: (f: DeskFilters) => void; selectedId: number | null; onSelect: (id: number) => void };

/** The open alarms, filtered; acknowledge one, or every one of the filtered tank at once. */
export function ActiveAlarms({ role, timeZone, places, filters, onFilters, selectedId, onSelect }: Props) {
  const q = useActiveAlarms();
  const wide = useMediaQuery('(min-width: 1024px)');
  const active = Object.values(filters).filter((v) => v !== undefined).length;
  const ack = useAcknowledgeAlarm();
  const ackTank = useAcknowledgeTank();
  if (q.isPending) return <Loading label="Loading alarms…" />;
  if (!q.data) return <ErrorState title="Alarms could not be loaded" detail={q.error?.message} onRetry={() => q.refetch()} />;

  const circuitOf = new Map(places.map((p) => [p.tankId, p.circuitId]));
  const latest = new Map(places.map((p) => [p.tankId, p.latest]));
  const shown = q.data.alarms
    .filter((a) => (!filters.site || a.siteTag === filters.site || a.siteTag === null) && (!filters.circuit || (a.tankId !== null && circuitOf.get(a.tankId) === filters.circuit)))
    .filter((a) => (!filters.tank || a.tankId === filters.tank) && (!filters.priority || a.priority === filters.priority) && (!filters.state || a.state === filters.state))
    .sort(deskOrder);
  const canAck = ACK_ROLES.includes(role);
  const tank = filters.tank ? places.find((p) => p.tankId === filters.tank) : undefined;
  const waitingOnTank = tank ? q.data.alarms.filter((a) => a.tankId === tank.tankId && isUnacknowledged(a.state)).length : 0;

  return (
    <div className="flex flex-col gap-3">
      <LiveStatusNotice />
      {/* On a phone the filters fold away, so the first alarm is on the first screen. */}
      <details open={wide || undefined} className="group">
        <summary className="cursor-pointer text-sm font-semibold text-ink-muted lg:hidden">Filters{active > 0 ? ` (${active} set)` : ''}</summary>
        <div className="mt-2 lg:mt-0">
          <AlarmFilters filters={filters} places={places} onChange={onFilters} />
        </div>
      </details>
      {canAck && tank && waitingOnTank > 0 && (
        <div className="flex justify-end">
          <Button onClick={() => ackTank.mutate({ tankId: tank.tankId })} disabled={ackTank.isPending}>
            Acknowledge all {waitingOnTank} of {tank.tankTag}
          </Button>
        </div>
      )}
      {shown.length === 0 ? (
        <p className="py-8 text-center text-ink-muted" data-testid="no-alarms">
          {q.data.alarms.length === 0 ? 'No open alarms.' : 'No open alarms match these filters.'}
        </p>
      ) : (
        <AlarmTable alarms={shown} selectedId={selectedId} timeZone={timeZone} canAck={canAck} onSelect={onSelect} onAcknowledge={(id) => ack.mutate({ id })} latest={latest} />
      )}
      {(ack.error || ackTank.error) && <p role="alert" className="text-sm text-attention-1-ink">{(ack.error ?? ackTank.error)?.message}</p>}
    </div>
  );
}
