import type { BandChangesQuery } from '@shared/schemas/bands';

export const bandKeys = {
  all: ['bands'] as const,
  list: () => [...bandKeys.all, 'list'] as const,
  changes: (filter: Partial<BandChangesQuery> = {}) => [...bandKeys.all, 'changes', filter] as const,
};
