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
