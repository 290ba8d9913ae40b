import type { DeadLetterQuery } from '@shared/schemas/dead-letters';

export const plantSetupKeys = {
  all: ['plant-setup'] as const,
  parts: () => [...plantSetupKeys.all, 'parts'] as const,
  deadLetters: (q: Partial<DeadLetterQuery>) => [...plantSetupKeys.all, 'dead-letters', q] as const,
};

/** The kinds of plant part, as the API's paths name them. */
export type PartKind = 'sites' | 'circuits' | 'tanks' | 'probes' | 'gateways';
