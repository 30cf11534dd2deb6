import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { PublicJobDto, PublicVariationDto } from '@shared/schemas/job-end';
import { api } from '@/lib/api';

/** Where the customer's job is, with the photos the workshop shared, through their quote link. */
export const publicJobKeys = {
  jobs: (token: string) => ['public-quote', token, 'jobs'] as const,
  variation: (token: string) => ['public-variation', token] as const,
};

const base = (token: string) => `/api/public/quotes/${encodeURIComponent(token)}`;

export const publicJobsQueryOptions = (token: string) =>
  queryOptions({
    queryKey: publicJobKeys.jobs(token),
    queryFn: ({ signal }) => api<PublicJobDto[]>(`${base(token)}/jobs`, { signal }),
    staleTime: 0,
  });

export function usePublicJobs(token: string, enabled: boolean) {
  return useQuery({ ...publicJobsQueryOptions(token), enabled });
}

const variationBase = (token: string) => `/api/public/variations/${encodeURIComponent(token)}`;

export function usePublicVariation(token: string) {
  return useQuery({ queryKey: publicJobKeys.variation(token), queryFn: ({ signal }) => api<PublicVariationDto>(variationBase(token), { signal }), staleTime: 0, retry: false });
}

/** The customer's answer to extra work: approve or decline, with an optional note. */
export function useAnswerVariation(token: string) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (a: { answer: 'approve' | 'decline'; note: string }) => api<PublicVariationDto>(`${variationBase(token)}/${a.answer}`, { method: 'POST', body: { note: a.note } }),
    onSuccess: (data) => qc.setQueryData(publicJobKeys.variation(token), data),
  });
}
