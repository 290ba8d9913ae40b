export const plantKeys = {
  all: ['plant'] as const,
  tree: () => [...plantKeys.all, 'tree'] as const,
  /** Server freshness verdicts per probe id, filled from probe:freshness events. */
  freshness: () => [...plantKeys.all, 'freshness'] as const,
  /** The last hour of one tank, for its tile's sparkline. */
  recent: (tankId: number) => [...plantKeys.all, 'recent', tankId] as const,
};
