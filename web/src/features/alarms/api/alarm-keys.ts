export type HistoryParams = { from: string; to: string; tank?: number; priority?: number; kind?: string; q?: string; offset?: number };
export type FiguresParams = { from: string; to: string };

export const alarmKeys = {
  all: ['alarms'] as const,
  active: () => [...alarmKeys.all, 'active'] as const,
  details: () => [...alarmKeys.all, 'detail'] as const,
  detail: (id: number) => [...alarmKeys.details(), id] as const,
  history: (p: HistoryParams) => [...alarmKeys.all, 'history', p] as const,
  figures: (p: FiguresParams) => [...alarmKeys.all, 'figures', p] as const,
  definitionLists: () => [...alarmKeys.all, 'definitions'] as const,
  definitions: (tankId: number) => [...alarmKeys.definitionLists(), tankId] as const,
  templates: () => [...alarmKeys.all, 'templates'] as const,
  shelveRules: () => [...alarmKeys.all, 'shelve-rules'] as const,
};
