import { useState } from 'react';
import type { AlarmView, DefinitionView } from '@shared/schemas/alarms';
import { useReturnToService } from '../api/return-to-service';
import { DefinitionForm } from './definition-form';
import { DefinitionRow, type RowAction } from './definition-row';
import { OutOfServiceForm } from './out-of-service-form';
import { ReasonForm } from './reason-form';

type Props = {
  definitions: DefinitionView[];
  alarms: AlarmView[];
  timeZone: string;
  canEdit: boolean;
  onSaved: (message: string) => void;
};

/** A tank's definitions, highest priority first; at most one form open at a time, under its row. */
export function DefinitionTable({ definitions, alarms, timeZone, canEdit, onSaved }: Props) {
  const [open, setOpen] = useState<{ id: number; action: RowAction } | null>(null);
  const rts = useReturnToService();
  const byDefinition = new Map(alarms.map((a) => [a.definitionId, a]));
  const sorted = [...definitions].sort((a, b) => a.priority - b.priority || a.id - b.id);
  const close = () => setOpen(null);
  const start = (id: number, action: RowAction) => {
    rts.reset();
    setOpen({ id, action });
  };

  const formFor = (d: DefinitionView) => {
    if (open?.action === 'edit') {
      return <DefinitionForm key={d.id} definition={d} onDone={(saved) => (close(), saved && onSaved(`Saved “${saved.label}” on ${saved.tankTag}. The reason is in the change record.`))} />;
    }
    if (open?.action === 'oos') {
      return <OutOfServiceForm definitionId={d.id} onDone={(saved) => (close(), saved && onSaved(`“${d.label}” on ${d.tankTag} is out of service.`))} />;
    }
    return (
      <ReasonForm label="What was done" action="Return to service" minLength={3} pending={rts.isPending} error={rts.error} onCancel={close}
        hint="For example: probe cleaned and checked against a standard solution."
        onSubmit={(comment) => rts.mutate({ definitionId: d.id, comment }, { onSuccess: () => (close(), onSaved(`“${d.label}” on ${d.tankTag} is back in service.`)) })} />
    );
  };

  return (
    <table className="w-full border-collapse text-left text-sm" data-testid="definition-table">
      <thead className="text-xs text-ink-muted">
        <tr className="border-b border-line">
          <th className="py-2 pr-2 font-semibold">Priority</th>
          <th className="pr-3 font-semibold">Alarm</th>
          <th className="pr-3 font-semibold">Sounds when</th>
          <th className="pr-3 text-right font-semibold">Deadband</th>
          <th className="pr-3 text-right font-semibold">On delay</th>
          <th className="pr-3 text-right font-semibold">Off delay</th>
          <th className="pr-3 text-right font-semibold">Window</th>
          <th className="pr-3 font-semibold">Now</th>
          <th className="font-semibold"><span className="sr-only">Actions</span></th>
        </tr>
      </thead>
      {sorted.map((d) => (
        <DefinitionRow key={d.id} definition={d} alarm={byDefinition.get(d.id)} timeZone={timeZone} canEdit={canEdit} open={open?.id === d.id}
          onAction={(action) => start(d.id, action)}>
          {open?.id === d.id && <div className={open.action === 'edit' ? '' : 'max-w-2xl'}>{formFor(d)}</div>}
        </DefinitionRow>
      ))}
    </table>
  );
}
