export const rosterKeys = {
  all: ['roster'] as const,
  now: () => [...rosterKeys.all, 'now'] as const,
  shifts: (from: string, to: string) => [...rosterKeys.all, 'shifts', from, to] as const,
  shiftLists: () => [...rosterKeys.all, 'shifts'] as const,
  policy: () => [...rosterKeys.all, 'policy'] as const,
  mail: () => [...rosterKeys.all, 'caught-mail'] as const,
};
