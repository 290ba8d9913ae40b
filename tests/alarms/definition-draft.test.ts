import { describe, expect, it } from 'vitest';
import { CIRCUIT_TEMPLATES } from '../../shared/alarms/templates.ts';
import { KIND_INFO } from '../../shared/alarms/kinds.ts';
import type { DefinitionView } from '../../shared/schemas/alarms.ts';
import { changesFrom, draftOf, NOTHING_CHANGED } from '../../web/src/features/alarms/utils/definition-draft.ts';

/** A definition as the API lists it, from the first demo template. */
function view(kind: DefinitionView['kind']): DefinitionView {
  const d = CIRCUIT_TEMPLATES[0].definitions.find((x) => x.kind === kind)!;
  const info = KIND_INFO[kind];
  return { ...d, id: 7, tankId: 1, tankTag: 'A1', label: info.label, unit: info.unit, deadbandUnit: info.deadbandUnit, limit: d.threshold ?? 8, updatedAt: '2026-12-01T00:00:00.000Z' };
}

describe('alarm definition form', () => {
  it('when only the limit and the reason are edited, then the body carries just the limit and the reason', () => {
    const d = view('orp-high');
    const result = changesFrom(d, { ...draftOf(d), threshold: '650', reason: 'Tighter limit after the trial' });
    expect(result).toEqual({ ok: true, input: { threshold: 650, reason: 'Tighter limit after the trial' } });
  });

  it('when one rationalisation text changes, then only that part is sent (the server merges the rest)', () => {
    const d = view('orp-rate');
    const result = changesFrom(d, { ...draftOf(d), action: 'Look at the trend now', responseMin: '5', reason: 'Faster response agreed' });
    expect(result).toEqual({ ok: true, input: { rationalisation: { action: 'Look at the trend now', responseMin: 5 }, reason: 'Faster response agreed' } });
  });

  it('when a decimal comma is typed, then it is read as a decimal point', () => {
    const d = view('temp-high');
    const result = changesFrom(d, { ...draftOf(d), deadband: '0,8', reason: 'Less chatter' });
    expect(result).toEqual({ ok: true, input: { deadband: 0.8, reason: 'Less chatter' } });
  });

  it('when fields are blank, fractional or out of range, then each gets a message under its own path', () => {
    const d = view('orp-rate');
    const result = changesFrom(d, { ...draftOf(d), threshold: '', onDelayS: '1.5', offDelayS: '-1', windowS: '10', cause: ' ', reason: 'ok' });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors).toMatchObject({
      threshold: 'Enter a number',
      onDelayS: 'Use a whole number',
      offDelayS: 'At least 0',
      windowS: 'At least 30 s',
      'rationalisation.cause': 'Enter the likely cause',
      reason: 'Give a reason (at least 3 characters)',
    });
  });

  it('when nothing but the reason is filled in, then the form says nothing has changed', () => {
    const d = view('ratio-below-band');
    const result = changesFrom(d, { ...draftOf(d), reason: 'Looked at it' });
    expect(result).toEqual({ ok: false, errors: { '': NOTHING_CHANGED } });
  });

  it('when a band kind is edited, then no threshold or window is sent even if the draft holds text for them', () => {
    const d = view('ratio-below-band');
    const result = changesFrom(d, { ...draftOf(d), threshold: '3', windowS: '60', priority: '2', reason: 'Less urgent on this tank' });
    expect(result).toEqual({ ok: true, input: { priority: 2, reason: 'Less urgent on this tank' } });
  });
});
