export type AssayFilter = { tankId?: number; includeRetracted?: 'true' | 'false'; limit?: number };

export const assayKeys = {
  all: ['assays'] as const,
  list: (filter: AssayFilter = {}) => [...assayKeys.all, 'list', filter] as const,
};
