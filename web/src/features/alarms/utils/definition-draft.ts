/**
 * The alarm definition form's values (text, as typed) and how they become a PATCH body: only
 * what changed is sent, with the reason, so the change record shows exactly what was edited.
 * Error keys are the API's field paths ('threshold', 'rationalisation.cause'), so messages
 * from the browser's check and from the server land under the same field.
 */
import { KIND_INFO } from '@shared/alarms/kinds';
import { updateDefinitionSchema, type DefinitionView, type Rationalisation, type UpdateDefinitionInput } from '@shared/schemas/alarms';
import { issuesByPath, type FieldErrors } from '../../../lib/form';

const NUMBERS = ['priority', 'threshold', 'deadband', 'onDelayS', 'offDelayS', 'windowS'] as const;
const TEXTS = ['cause', 'consequence', 'action'] as const;
type NumberKey = (typeof NUMBERS)[number];

export type DefinitionDraft = Record<NumberKey | (typeof TEXTS)[number] | 'responseMin' | 'reason', string>;

export const NOTHING_CHANGED = 'Nothing has changed yet: edit a setting, then save.';

const text = (v: number | null) => (v === null ? '' : String(v));
const toNumber = (s: string) => (s.trim() === '' ? Number.NaN : Number(s.trim().replace(',', '.')));

/** Which settings a kind has: band kinds take their limit from Bands, only some kinds use a window. */
export function fieldsOf(kind: DefinitionView['kind']): { threshold: boolean; window: boolean } {
  return { threshold: KIND_INFO[kind].limitFrom === 'threshold', window: KIND_INFO[kind].windowed };
}

export function draftOf(d: DefinitionView): DefinitionDraft {
  const r = d.rationalisation;
  return {
    priority: String(d.priority), threshold: text(d.threshold), deadband: String(d.deadband), onDelayS: String(d.onDelayS),
    offDelayS: String(d.offDelayS), windowS: text(d.windowS), cause: r.cause, consequence: r.consequence, action: r.action,
    responseMin: String(r.responseMin), reason: '',
  };
}

export type DraftResult = { ok: true; input: UpdateDefinitionInput } | { ok: false; errors: FieldErrors };

/** The PATCH body for what the draft changes, checked with the shared schema; '' keys a form-level message. */
export function changesFrom(d: DefinitionView, draft: DefinitionDraft): DraftResult {
  const uses = fieldsOf(d.kind);
  const body: Record<string, unknown> = {};
  for (const key of NUMBERS) {
    if ((key === 'threshold' && !uses.threshold) || (key === 'windowS' && !uses.window)) continue;
    const value = toNumber(draft[key]);
    if (value !== d[key]) body[key] = value;
  }
  const rationalisation: Partial<Rationalisation> = {};
  for (const key of TEXTS) if (draft[key].trim() !== d.rationalisation[key]) rationalisation[key] = draft[key];
  const responseMin = toNumber(draft.responseMin);
  if (responseMin !== d.rationalisation.responseMin) rationalisation.responseMin = responseMin;
  if (Object.keys(rationalisation).length) body.rationalisation = rationalisation;

  const parsed = updateDefinitionSchema.safeParse({ ...body, reason: draft.reason });
  if (parsed.success) return { ok: true, input: parsed.data };
  const errors = issuesByPath(parsed.error.issues);
  if (errors[''] || Object.keys(body).length === 0) errors[''] = NOTHING_CHANGED;
  return { ok: false, errors };
}
