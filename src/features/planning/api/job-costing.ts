import { queryOptions, useQuery } from '@tanstack/react-query';
import type { JobCosting } from '@shared/schemas/stock';
import { api } from '@/lib/api';

export const jobCostingKeys = { of: (jobId: number) => ['planning', 'jobs', jobId, 'costing'] as const };

export const jobCostingOptions = (jobId: number) =>
  queryOptions({ queryKey: jobCostingKeys.of(jobId), queryFn: ({ signal }) => api<JobCosting>(`/api/jobs/${jobId}/costing`, { signal }) });

/** What the job really cost: the owner's only (the server refuses anyone else). */
export const useJobCosting = (jobId: number, enabled: boolean) => useQuery({ ...jobCostingOptions(jobId), enabled });
