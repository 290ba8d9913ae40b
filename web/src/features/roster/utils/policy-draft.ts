/**
 * The escalation form's values (minutes as typed) and how they become the PUT body for one
 * priority. Error keys are the API's field paths ('steps.1.afterMin', 'steps', 'reason').
 */
import { policySchema, type EscalationStepView, type OnCallRole, type PolicyInput } from '@shared/schemas/roster';
import { issuesByPath, type FieldErrors } from '../../../lib/form';

export type StepDraft = { afterMin: string; notify: OnCallRole[] };
export type PolicyDraft = { steps: StepDraft[]; reason: string };

export const MAX_STEPS = 5;

export function draftOf(priority: number, steps: EscalationStepView[]): PolicyDraft {
  return { steps: steps.filter((s) => s.priority === priority).sort((a, b) => a.step - b.step).map((s) => ({ afterMin: String(s.afterMin), notify: [...s.notify] })), reason: '' };
}

/** The next step a person adds: later than the last one, to the on-call engineer. */
export function nextStep(steps: StepDraft[]): StepDraft {
  const last = Number(steps.at(-1)?.afterMin);
  return { afterMin: Number.isFinite(last) && last > 0 ? String(last + 15) : '5', notify: ['primary'] };
}

export type PolicyResult = { ok: true; input: PolicyInput } | { ok: false; errors: FieldErrors };

export function policyFrom(priority: number, draft: PolicyDraft): PolicyResult {
  const steps = draft.steps.map((s) => ({ afterMin: s.afterMin.trim() === '' ? Number.NaN : Number(s.afterMin.trim()), notify: s.notify }));
  const parsed = policySchema.safeParse({ priority, steps, reason: draft.reason });
  if (parsed.success) return { ok: true, input: parsed.data };
  const errors = issuesByPath(parsed.error.issues);
  // The schema's order rule names the list; say it under the first step that comes too early.
  const early = steps.findIndex((s, i) => i > 0 && s.afterMin <= steps[i - 1].afterMin);
  if (errors.steps && early > 0 && !errors[`steps.${early}.afterMin`]) {
    errors[`steps.${early}.afterMin`] = `Must be later than step ${early} (${steps[early - 1].afterMin} min)`;
    delete errors.steps;
  }
  return { ok: false, errors };
}
