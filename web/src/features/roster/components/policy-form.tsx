import { useState, type FormEvent } from 'react';
import { PRIORITY_LABEL, type Priority } from '@shared/alarms/kinds';
import { ON_CALL_LABEL, ON_CALL_ROLES, type EscalationStepView, type OnCallRole } from '@shared/schemas/roster';
import { Button } from '../../../components/ui/button';
import { FormError, TextField } from '../../../components/ui/field';
import { serverErrorsByPath, unplacedMessage, type FieldErrors } from '../../../lib/form';
import { useSetPolicy } from '../api/set-policy';
import { draftOf, MAX_STEPS, nextStep, policyFrom, type PolicyDraft, type StepDraft } from '../utils/policy-draft';

function ErrorLine({ children }: { children?: string }) {
  if (!children) return null;
  return <p className="text-sm font-medium text-attention-1-ink"><span aria-hidden="true">✕ </span>{children}</p>;
}

type Props = { priority: Priority; steps: EscalationStepView[]; onDone: (saved: boolean) => void };

/** One priority's escalation steps, replaced at once: after how many minutes unacknowledged, whom to e-mail. */
export function PolicyForm({ priority, steps, onDone }: Props) {
  const [draft, setDraft] = useState<PolicyDraft>(() => draftOf(priority, steps));
  const [errors, setErrors] = useState<FieldErrors>({});
  const save = useSetPolicy();
  const server = serverErrorsByPath(save.error);
  const err = (path: string) => errors[path] ?? server[path];
  const setStep = (i: number, change: Partial<StepDraft>) => setDraft((d) => ({ ...d, steps: d.steps.map((s, j) => (j === i ? { ...s, ...change } : s)) }));
  const toggle = (i: number, role: OnCallRole) => {
    const had = draft.steps[i].notify;
    setStep(i, { notify: ON_CALL_ROLES.filter((r) => (r === role ? !had.includes(r) : had.includes(r))) });
  };
  const shown = ['steps', 'reason', ...draft.steps.flatMap((_, i) => [`steps.${i}.afterMin`, `steps.${i}.notify`])];

  const submit = (e: FormEvent) => {
    e.preventDefault();
    const result = policyFrom(priority, draft);
    if (!result.ok) return setErrors(result.errors);
    setErrors({});
    save.mutate(result.input, { onSuccess: () => onDone(true) });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={`Escalation for ${PRIORITY_LABEL[priority]}`} className="flex flex-col gap-3" data-testid={`policy-form-${priority}`}>
      <FormError>{unplacedMessage(save.error, shown)}</FormError>
      {draft.steps.length === 0 && <p className="text-sm text-ink-muted">No e-mail for this priority: its alarms show on screens only.</p>}
      <ol className="flex flex-col gap-3">
        {draft.steps.map((s, i) => (
          <li key={i} className="rounded-md border border-line p-3" aria-label={`Step ${i + 1}`}>
            <div className="flex items-start justify-between gap-3">
              <div className="w-32">
                <TextField label={`Step ${i + 1} after`} inputMode="numeric" unit="min" value={s.afterMin}
                  onChange={(e) => setStep(i, { afterMin: e.target.value })} error={err(`steps.${i}.afterMin`)} />
              </div>
              <Button size="sm" variant="ghost" onClick={() => setDraft((d) => ({ ...d, steps: d.steps.filter((_, j) => j !== i) }))} aria-label={`Remove step ${i + 1}`}>
                Remove
              </Button>
            </div>
            <fieldset className="mt-2">
              <legend className="mb-1 text-sm font-semibold">E-mail to</legend>
              <div className="flex flex-wrap gap-x-4 gap-y-1">
                {ON_CALL_ROLES.map((r) => (
                  <label key={r} className="inline-flex items-center gap-2 text-sm">
                    <input type="checkbox" className="h-4 w-4" checked={s.notify.includes(r)} onChange={() => toggle(i, r)} />
                    {ON_CALL_LABEL[r]}
                  </label>
                ))}
              </div>
              <ErrorLine>{err(`steps.${i}.notify`)}</ErrorLine>
            </fieldset>
          </li>
        ))}
      </ol>
      <ErrorLine>{err('steps')}</ErrorLine>
      <div>
        <Button size="sm" onClick={() => setDraft((d) => ({ ...d, steps: [...d.steps, nextStep(d.steps)] }))} disabled={draft.steps.length >= MAX_STEPS}>
          Add a step
        </Button>
        {draft.steps.length >= MAX_STEPS && <span className="ml-2 text-sm text-ink-muted">At most {MAX_STEPS} steps.</span>}
      </div>
      <TextField label="Reason for the change" value={draft.reason} onChange={(e) => setDraft((d) => ({ ...d, reason: e.target.value }))} error={err('reason')} maxLength={500}
        hint="Kept in the change record with your name and the time." />
      <div className="flex justify-end gap-3">
        <Button onClick={() => onDone(false)}>Cancel</Button>
        <Button type="submit" variant="primary" disabled={save.isPending}>{save.isPending ? 'Saving…' : 'Save escalation'}</Button>
      </div>
    </form>
  );
}
