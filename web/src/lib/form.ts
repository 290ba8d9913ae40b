import { ApiError } from './api-client';

export type FieldErrors = Partial<Record<string, string>>;

/** First message per top-level field from zod issues (zod 4: path is PropertyKey[]). */
export function issuesToFieldErrors(issues: ReadonlyArray<{ path: ReadonlyArray<PropertyKey>; message: string }>): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of issues) {
    const key = String(issue.path[0] ?? '');
    if (key && !out[key]) out[key] = issue.message;
  }
  return out;
}

/** Server-side field errors (400 with errors[]), or none. */
export function serverFieldErrors(error: unknown): FieldErrors {
  return error instanceof ApiError ? error.fieldErrors() : {};
}

/** A sentence for the form-level message, when the server error is not about one field. */
export function formMessage(error: unknown): string | null {
  if (!error) return null;
  if (error instanceof ApiError) {
    if (error.errors.length > 0) return null;
    return error.detail || error.title;
  }
  return 'Something went wrong. Try again.';
}

type Issue = { path: ReadonlyArray<PropertyKey>; message: string; code?: string; expected?: string; minimum?: unknown; maximum?: unknown };

/** zod's stock wording ("Too small: expected number to be >=0") said the way a form should say it. */
export function plainMessage(issue: Issue): string {
  if (issue.code === 'invalid_type' && issue.expected === 'int') return 'Use a whole number';
  if (issue.code === 'invalid_type' && issue.expected === 'number') return 'Enter a number';
  if (issue.code === 'too_small' && issue.message.startsWith('Too small')) return `At least ${String(issue.minimum)}`;
  if (issue.code === 'too_big' && issue.message.startsWith('Too big')) return `At most ${String(issue.maximum)}`;
  return issue.message;
}

/** First message per full path ('rationalisation.cause', 'steps.1.afterMin'), for forms with nested fields. */
export function issuesByPath(issues: ReadonlyArray<Issue>): FieldErrors {
  const out: FieldErrors = {};
  for (const issue of issues) {
    const key = issue.path.map(String).join('.');
    if (!out[key]) out[key] = plainMessage(issue);
  }
  return out;
}

/** Server-side field errors by full path (400 with errors[]), or none. */
export function serverErrorsByPath(error: unknown): FieldErrors {
  if (!(error instanceof ApiError)) return {};
  const out: FieldErrors = {};
  for (const e of error.errors) if (!out[e.path]) out[e.path] = e.message;
  return out;
}

/**
 * The form-level sentence when some messages have no field to stand under: the server's detail
 * for a non-field error, or the field messages whose path the form does not show.
 */
export function unplacedMessage(error: unknown, shown: ReadonlyArray<string>): string | null {
  if (error instanceof ApiError && error.errors.length > 0) {
    const rest = error.errors.filter((e) => !shown.includes(e.path));
    return rest.length ? rest.map((e) => e.message).join('; ') : null;
  }
  return formMessage(error);
}
