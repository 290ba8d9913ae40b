import { useState } from 'react';
import { canApply } from '@shared/alarms/states';
import type { AlarmView } from '@shared/schemas/alarms';
import type { Role } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { useAcknowledgeAlarm } from '../api/acknowledge-alarm';
import { useCommentAlarm } from '../api/comment-alarm';
import { useRemoveFromService } from '../api/remove-from-service';
import { useReturnToService } from '../api/return-to-service';
import { useUnshelveAlarm } from '../api/unshelve-alarm';
import { ACK_ROLES, SERVICE_ROLES } from './desk-types';
import { ReasonForm } from './reason-form';
import { ShelveForm } from './shelve-form';

type Open = null | 'ack' | 'shelve' | 'oos' | 'rts';

/**
 * What this person may do with this alarm now: offered only when both the role (server rules,
 * mirrored) and the lifecycle state machine allow it. Everyone may comment.
 */
export function AlarmActions({ alarm, role }: { alarm: AlarmView; role: Role }) {
  const [open, setOpen] = useState<Open>(null);
  const ack = useAcknowledgeAlarm();
  const unshelve = useUnshelveAlarm();
  const comment = useCommentAlarm();
  const oos = useRemoveFromService();
  const rts = useReturnToService();
  const status = { state: alarm.state, conditionActive: alarm.conditionActive };
  const closed = alarm.closedAt !== null;
  const acker = ACK_ROLES.includes(role);
  const service = SERVICE_ROLES.includes(role);
  const done = () => setOpen(null);

  return (
    <div className="flex flex-col gap-3">
      {!closed && (
        <div className="flex flex-wrap gap-2">
          {acker && canApply(status, 'acknowledge') && <Button variant="primary" onClick={() => ack.mutate({ id: alarm.id })} disabled={ack.isPending}>Acknowledge</Button>}
          {acker && canApply(status, 'acknowledge') && <Button onClick={() => setOpen('ack')}>Acknowledge with note…</Button>}
          {acker && canApply(status, 'shelve') && <Button onClick={() => setOpen('shelve')}>Shelve…</Button>}
          {acker && canApply(status, 'unshelve') && <Button onClick={() => unshelve.mutate({ id: alarm.id })} disabled={unshelve.isPending}>Unshelve</Button>}
          {service && canApply(status, 'remove-from-service') && <Button onClick={() => setOpen('oos')}>Take out of service…</Button>}
          {service && canApply(status, 'return-to-service') && <Button onClick={() => setOpen('rts')}>Return to service…</Button>}
        </div>
      )}
      {open === 'ack' && (
        <ReasonForm label="Note" action="Acknowledge" minLength={1} pending={ack.isPending} error={ack.error} onCancel={done}
          onSubmit={(text) => ack.mutate({ id: alarm.id, comment: text }, { onSuccess: done })} />
      )}
      {open === 'shelve' && <ShelveForm alarmId={alarm.id} onDone={done} />}
      {open === 'oos' && (
        <ReasonForm label="Reason" action="Take out of service" minLength={3} pending={oos.isPending} error={oos.error} onCancel={done}
          hint="For example: probe pulled for cleaning. The alarm stays silent until returned to service."
          onSubmit={(reason) => oos.mutate({ definitionId: alarm.definitionId, reason }, { onSuccess: done })} />
      )}
      {open === 'rts' && (
        <ReasonForm label="What was done" action="Return to service" minLength={3} pending={rts.isPending} error={rts.error} onCancel={done}
          onSubmit={(text) => rts.mutate({ definitionId: alarm.definitionId, comment: text }, { onSuccess: done })} />
      )}
      <ReasonForm label="Comment" action="Add comment" minLength={1} pending={comment.isPending} error={comment.error}
        onSubmit={(text, clear) => comment.mutate({ id: alarm.id, text }, { onSuccess: clear })} />
    </div>
  );
}
