/** Query keys of the planning feature, from general to specific. */
export const planningKeys = {
  all: ['planning'] as const,
  board: (from: string | undefined, weeks: number) => ['planning', 'board', from ?? 'this-week', weeks] as const,
  ready: ['planning', 'ready'] as const,
  jobs: ['planning', 'jobs'] as const,
  job: (id: number) => ['planning', 'jobs', id] as const,
  polishers: ['planning', 'polishers'] as const,
};
