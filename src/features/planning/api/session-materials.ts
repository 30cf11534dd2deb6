import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SessionMaterialLine } from '@shared/schemas/stock';
import { api } from '@/lib/api';

export const sessionMaterialsKeys = {
  of: (jobId: number, sessionId: number) => ['planning', 'jobs', jobId, 'sessions', sessionId, 'materials'] as const,
};

/** What a session is expected to use (the estimate's share), in packs: the prefill of the materials used. */
export const sessionMaterialsOptions = (jobId: number, sessionId: number) =>
  queryOptions({
    queryKey: sessionMaterialsKeys.of(jobId, sessionId),
    queryFn: ({ signal }) => api<SessionMaterialLine[]>(`/api/jobs/${jobId}/sessions/${sessionId}/materials`, { signal }),
  });

export const useSessionMaterials = (jobId: number, sessionId: number) => useQuery(sessionMaterialsOptions(jobId, sessionId));
