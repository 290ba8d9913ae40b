import { describe, expect, it } from 'vitest';
import type { EscalationStepView } from '../../shared/schemas/roster.ts';
import { draftOf, nextStep, policyFrom } from '../../web/src/features/roster/utils/policy-draft.ts';

const SEEDED: EscalationStepView[] = [
  { priority: 1, step: 2, afterMin: 15, notify: ['supervisor', 'backup'] },
  { priority: 1, step: 1, afterMin: 5, notify: ['primary'] },
  { priority: 2, step: 1, afterMin: 30, notify: ['primary'] },
];

describe('escalation policy form', () => {
  it('when a priority is opened, then its steps come in step order with minutes as text', () => {
    expect(draftOf(1, SEEDED)).toEqual({ steps: [{ afterMin: '5', notify: ['primary'] }, { afterMin: '15', notify: ['supervisor', 'backup'] }], reason: '' });
    expect(draftOf(3, SEEDED).steps).toEqual([]);
  });

  it('when a step is added, then it comes 15 min after the last one, to the on-call engineer', () => {
    expect(nextStep([])).toEqual({ afterMin: '5', notify: ['primary'] });
    expect(nextStep(draftOf(1, SEEDED).steps)).toEqual({ afterMin: '30', notify: ['primary'] });
  });

  it('when the steps are valid, then the body replaces the priority at once', () => {
    const result = policyFrom(3, { steps: [{ afterMin: ' 120 ', notify: ['primary'] }], reason: 'Low priority mails after 2 h' });
    expect(result).toEqual({ ok: true, input: { priority: 3, steps: [{ afterMin: 120, notify: ['primary'] }], reason: 'Low priority mails after 2 h' } });
  });

  it('when every step is removed, then the priority sends no e-mail (an empty list is allowed)', () => {
    expect(policyFrom(2, { steps: [], reason: 'Screens only' })).toMatchObject({ ok: true, input: { steps: [] } });
  });

  it('when a step comes too early, has no one to notify or no minutes, then the message stands under that step', () => {
    const result = policyFrom(1, {
      steps: [{ afterMin: '10', notify: ['primary'] }, { afterMin: '10', notify: [] }, { afterMin: '', notify: ['backup'] }],
      reason: '',
    });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors).toMatchObject({
      'steps.1.notify': 'Pick whom to notify',
      'steps.2.afterMin': 'Enter a number',
      reason: 'Give a reason',
    });
  });

  it('when steps are out of time order, then the later-listed step is named, not the whole list', () => {
    const result = policyFrom(1, { steps: [{ afterMin: '15', notify: ['primary'] }, { afterMin: '5', notify: ['backup'] }], reason: 'Swap' });
    expect(result).toEqual({ ok: false, errors: { 'steps.1.afterMin': 'Must be later than step 1 (15 min)' } });
  });
});
