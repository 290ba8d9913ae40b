import type { z } from 'zod';

/** Compact zod issues as "path: message; path: message" (dead-letter reasons, log lines). */
export function describeIssues(error: z.ZodError, prefix = ''): string {
  return error.issues
    .map((i) => `${[prefix, ...i.path.map(String)].filter(Boolean).join('.') || '(root)'}: ${i.message}`)
    .join('; ');
}
