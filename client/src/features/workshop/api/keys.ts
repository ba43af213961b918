export const workshopKeys = {
  all: ['workshop'] as const,
  current: () => [...workshopKeys.all, 'current'] as const,
};
