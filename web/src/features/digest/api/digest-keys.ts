import type { DigestParams } from './get-digest';

export const digestKeys = {
  all: ['digest'] as const,
  digests: () => [...digestKeys.all, 'digest'] as const,
  digest: (p: DigestParams) => [...digestKeys.digests(), p.shiftStart ?? '', p.from ?? '', p.to ?? ''] as const,
  shifts: (count: number) => [...digestKeys.all, 'shifts', count] as const,
  imports: () => [...digestKeys.all, 'imports'] as const,
  importJob: (id: number) => [...digestKeys.imports(), id] as const,
};
