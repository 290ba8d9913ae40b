import { useState, type FormEvent } from 'react';
import { KIND_INFO, PRIORITIES, PRIORITY_LABEL } from '@shared/alarms/kinds';
import type { DefinitionView } from '@shared/schemas/alarms';
import { Button } from '../../../components/ui/button';
import { FormError, SelectField, TextAreaField, TextField } from '../../../components/ui/field';
import { formatRatio } from '../../../lib/format';
import { serverErrorsByPath, unplacedMessage, type FieldErrors } from '../../../lib/form';
import { useUpdateDefinition } from '../api/update-definition';
import { changesFrom, draftOf, fieldsOf, type DefinitionDraft } from '../utils/definition-draft';

const SHOWN = ['priority', 'threshold', 'deadband', 'onDelayS', 'offDelayS', 'windowS', 'rationalisation.cause',
  'rationalisation.consequence', 'rationalisation.action', 'rationalisation.responseMin', 'reason'];

type Props = { definition: DefinitionView; onDone: (saved?: DefinitionView) => void };

/** Change one definition's settings and rationalisation; the reason goes to the change record. */
export function DefinitionForm({ definition: d, onDone }: Props) {
  const [draft, setDraft] = useState<DefinitionDraft>(() => draftOf(d));
  const [errors, setErrors] = useState<FieldErrors>({});
  const update = useUpdateDefinition();
  const server = serverErrorsByPath(update.error);
  const err = (path: string) => errors[path] ?? server[path];
  const set = (k: keyof DefinitionDraft) => (e: { target: { value: string } }) => setDraft((v) => ({ ...v, [k]: e.target.value }));
  const uses = fieldsOf(d.kind);
  const band = KIND_INFO[d.kind].limitFrom === 'band-low' ? 'low' : 'high';

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const result = changesFrom(d, draft);
    if (!result.ok) return setErrors(result.errors);
    setErrors({});
    update.mutate({ id: d.id, input: result.input }, { onSuccess: (saved) => onDone(saved) });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={`Change ${d.label} on ${d.tankTag}`} className="flex flex-col gap-4" data-testid="definition-form">
      <h3 className="font-bold">Change “{d.label}” on {d.tankTag}</h3>
      <FormError>{errors[''] ?? unplacedMessage(update.error, SHOWN)}</FormError>
      <div className="grid gap-3 sm:grid-cols-3 xl:grid-cols-6">
        <SelectField label="Priority" value={draft.priority} onChange={set('priority')} error={err('priority')}
          options={PRIORITIES.map((p) => ({ value: String(p), label: PRIORITY_LABEL[p] }))} />
        {uses.threshold ? (
          <TextField label="Limit" inputMode="decimal" unit={d.unit} value={draft.threshold} onChange={set('threshold')} error={err('threshold')} />
        ) : (
          <div className="flex flex-col gap-1 text-sm">
            <span className="font-semibold">Limit</span>
            <span className="flex h-10 items-center tabular-nums">{formatRatio(d.limit)} <span className="ml-1 text-ink-muted">band {band}</span></span>
            <span className="text-ink-muted">Changed on Bands</span>
          </div>
        )}
        <TextField label="Deadband" inputMode="decimal" unit={d.deadbandUnit} value={draft.deadband} onChange={set('deadband')} error={err('deadband')}
          hint="How far back inside the limit before it clears" />
        <TextField label="On delay" inputMode="numeric" unit="s" value={draft.onDelayS} onChange={set('onDelayS')} error={err('onDelayS')}
          hint="Must hold this long to sound" />
        <TextField label="Off delay" inputMode="numeric" unit="s" value={draft.offDelayS} onChange={set('offDelayS')} error={err('offDelayS')}
          hint="Must stay clear this long" />
        {uses.window && (
          <TextField label="Window" inputMode="numeric" unit="s" value={draft.windowS} onChange={set('windowS')} error={err('windowS')}
            hint="Readings looked at together" />
        )}
      </div>
      <fieldset className="grid gap-3 lg:grid-cols-3">
        <legend className="mb-2 text-sm font-bold">Rationalisation, shown to whoever handles the alarm</legend>
        <TextAreaField label="What to do" value={draft.action} onChange={set('action')} error={err('rationalisation.action')} maxLength={1000} />
        <TextAreaField label="Likely cause" value={draft.cause} onChange={set('cause')} error={err('rationalisation.cause')} maxLength={1000} />
        <TextAreaField label="If nobody acts" value={draft.consequence} onChange={set('consequence')} error={err('rationalisation.consequence')} maxLength={1000} />
      </fieldset>
      <div className="grid gap-3 sm:grid-cols-[12rem_1fr]">
        <TextField label="Respond within" inputMode="numeric" unit="min" value={draft.responseMin} onChange={set('responseMin')} error={err('rationalisation.responseMin')} />
        <TextField label="Reason for the change" value={draft.reason} onChange={set('reason')} error={err('reason')} maxLength={500}
          hint="Kept in the change record with your name, the time and the settings before and after." />
      </div>
      <div className="flex justify-end gap-3">
        <Button onClick={() => onDone()}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={update.isPending}>{update.isPending ? 'Saving…' : 'Save changes'}</Button>
      </div>
    </form>
  );
}
