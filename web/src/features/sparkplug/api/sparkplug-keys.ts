export const sparkplugKeys = {
  all: ['sparkplug'] as const,
  setup: () => [...sparkplugKeys.all, 'setup'] as const,
};
