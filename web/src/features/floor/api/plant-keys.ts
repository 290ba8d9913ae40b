export const plantKeys = {
  all: ['plant'] as const,
  tree: () => [...plantKeys.all, 'tree'] as const,
  /** Server freshness verdicts per probe id, filled from probe:freshness events. */
  freshness: () => [...plantKeys.all, 'freshness'] as const,
};
