import { useState } from 'react';
import { mayShelve, type ShelveRule } from '@shared/alarms/roles';
import { canApply } from '@shared/alarms/states';
import type { AlarmView } from '@shared/schemas/alarms';
import type { Role } from '@shared/schemas/auth';
import { Button } from '../../../components/ui/button';
import { useAcknowledgeAlarm } from '../api/acknowledge-alarm';
import { useCommentAlarm } from '../api/comment-alarm';
import { useReturnToService } from '../api/return-to-service';
import { useUnshelveAlarm } from '../api/unshelve-alarm';
import { ACK_ROLES, SERVICE_ROLES } from './desk-types';
import { NoteForm } from './note-form';
import { OutOfServiceForm } from './out-of-service-form';
import { ReasonForm } from './reason-form';
import { ShelveForm } from './shelve-form';

type Open = null | 'shelve' | 'oos' | 'rts';

/**
 * What this person may do with this alarm now: offered only when both the role (server rules,
 * shared) and the lifecycle state machine allow it. Everyone may comment; one note box serves
 * acknowledging and commenting. `shelveRule` is the site's (who may shelve, for how long).
 */
export function AlarmActions({ alarm, role, shelveRule }: { alarm: AlarmView; role: Role; shelveRule?: ShelveRule }) {
  const [open, setOpen] = useState<Open>(null);
  const ack = useAcknowledgeAlarm();
  const unshelve = useUnshelveAlarm();
  const comment = useCommentAlarm();
  const rts = useReturnToService();
  const status = { state: alarm.state, conditionActive: alarm.conditionActive };
  const closed = alarm.closedAt !== null;
  const canAck = !closed && ACK_ROLES.includes(role) && canApply(status, 'acknowledge');
  const shelver = !!shelveRule && mayShelve(role, shelveRule);
  const service = SERVICE_ROLES.includes(role);
  const done = () => setOpen(null);

  return (
    <div className="flex flex-col gap-3">
      {!closed && (
        <div className="flex flex-wrap gap-2">
          {shelver && canApply(status, 'shelve') && <Button onClick={() => setOpen('shelve')}>Shelve…</Button>}
          {ACK_ROLES.includes(role) && canApply(status, 'unshelve') && <Button onClick={() => unshelve.mutate({ id: alarm.id })} disabled={unshelve.isPending}>Unshelve</Button>}
          {service && canApply(status, 'remove-from-service') && <Button onClick={() => setOpen('oos')}>Take out of service…</Button>}
          {service && canApply(status, 'return-to-service') && <Button onClick={() => setOpen('rts')}>Return to service…</Button>}
        </div>
      )}
      {open === 'shelve' && shelveRule && <ShelveForm alarmId={alarm.id} maxHours={shelveRule.maxShelveHours} onDone={done} />}
      {open === 'oos' && <OutOfServiceForm definitionId={alarm.definitionId} onDone={done} />}
      {open === 'rts' && (
        <ReasonForm label="What was done" action="Return to service" minLength={3} pending={rts.isPending} error={rts.error} onCancel={done}
          onSubmit={(text) => rts.mutate({ definitionId: alarm.definitionId, comment: text }, { onSuccess: done })} />
      )}
      <NoteForm canAck={canAck} ackPending={ack.isPending} commentPending={comment.isPending} error={ack.error ?? comment.error}
        onAcknowledge={(note, clear) => ack.mutate({ id: alarm.id, comment: note }, { onSuccess: clear })}
        onComment={(text, clear) => comment.mutate({ id: alarm.id, text }, { onSuccess: clear })} />
    </div>
  );
}
