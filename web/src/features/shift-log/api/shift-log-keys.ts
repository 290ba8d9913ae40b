export const shiftLogKeys = {
  all: ['shift-log'] as const,
  logs: () => [...shiftLogKeys.all, 'log'] as const,
  /** at: an instant inside the shift, or 'current' for where new entries go. */
  log: (at: string) => [...shiftLogKeys.logs(), at] as const,
  pattern: () => [...shiftLogKeys.all, 'pattern'] as const,
};
