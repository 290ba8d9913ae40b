export const calibrationKeys = {
  all: ['calibration'] as const,
  overview: (tankId: number) => [...calibrationKeys.all, 'overview', tankId] as const,
  tankAssays: (tankId: number, from: string, to: string) => [...calibrationKeys.all, 'assays', tankId, from, to] as const,
  probeChecksAll: () => [...calibrationKeys.all, 'probe-checks'] as const,
  probeChecks: (probeId?: number) => [...calibrationKeys.probeChecksAll(), probeId ?? 'all'] as const,
  schedule: () => [...calibrationKeys.all, 'schedule'] as const,
  replacementsAll: () => [...calibrationKeys.all, 'replacements'] as const,
  replacements: (probeId?: number) => [...calibrationKeys.replacementsAll(), probeId ?? 'all'] as const,
};
