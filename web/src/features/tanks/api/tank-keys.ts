export const tankKeys = {
  all: ['tanks'] as const,
  detail: (id: number) => [...tankKeys.all, id] as const,
  trends: (id: number) => [...tankKeys.detail(id), 'trend'] as const,
  /** rangeKey: a preset ('8h') or 'from/to' for a custom range. */
  trend: (id: number, rangeKey: string) => [...tankKeys.trends(id), rangeKey] as const,
  assays: (id: number, rangeKey: string) => [...tankKeys.detail(id), 'assays', rangeKey] as const,
};
