export const doseKeys = {
  all: ['dose'] as const,
  inputs: (tankId: number) => [...doseKeys.all, 'inputs', tankId] as const,
};
