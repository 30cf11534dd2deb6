import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { CustodyEvent, JobEndDto, JobLogisticsInput, JobNoteDto, KeepPolisherInput, PhotoPhase, ProgressPhotoDto, VariationDto, VariationInput } from '@shared/schemas/job-end';
import { api } from '@/lib/api';
import { planningKeys } from './planning-keys';

/** A job's end: collection and return, where the piece is, the kept hand, notes, progress photos and variations. */
export const jobEndKey = (id: number) => [...planningKeys.job(id), 'end'] as const;

export const jobEndQueryOptions = (id: number) =>
  queryOptions({ queryKey: jobEndKey(id), queryFn: ({ signal }) => api<JobEndDto>(`/api/jobs/${id}/end`, { signal }) });

export function useJobEnd(id: number) {
  return useQuery({ ...jobEndQueryOptions(id), enabled: id > 0 });
}

function useRefresh() {
  const qc = useQueryClient();
  return async () => {
    await qc.invalidateQueries({ queryKey: planningKeys.all });
  };
}

function useEndMutation<I, O>(_id: number, fn: (input: I) => Promise<O>) {
  const refresh = useRefresh();
  return useMutation({ mutationFn: fn, onSuccess: refresh });
}

export const useSetLogistics = (id: number) => useEndMutation(id, (input: JobLogisticsInput) => api<JobEndDto>(`/api/jobs/${id}/logistics`, { method: 'PUT', body: input }));
export const useMoveCustody = (id: number) => useEndMutation(id, (event: CustodyEvent) => api<JobEndDto>(`/api/jobs/${id}/custody`, { method: 'POST', body: { event } }));
export const useKeepPolisher = (id: number) => useEndMutation(id, (input: KeepPolisherInput) => api<JobEndDto>(`/api/jobs/${id}/keep`, { method: 'PUT', body: input }));
export const useAddNote = (id: number) => useEndMutation(id, (body: string) => api<JobNoteDto>(`/api/jobs/${id}/notes`, { method: 'POST', body: { body } }));
export const useSharePhoto = (id: number) =>
  useEndMutation(id, ({ photoId, shared }: { photoId: number; shared: boolean }) => api<ProgressPhotoDto>(`/api/jobs/${id}/progress-photos/${photoId}/shared`, { method: 'PUT', body: { shared } }));
export const useAddProgressPhotos = (id: number) =>
  useEndMutation(id, ({ phase, files, caption }: { phase: PhotoPhase; files: File[]; caption: string }) => {
    const form = new FormData();
    form.append('phase', phase);
    for (const f of files) {
      form.append('photos', f);
      form.append('captions', caption);
    }
    return api<ProgressPhotoDto[]>(`/api/jobs/${id}/progress-photos`, { method: 'POST', body: form });
  });
export const useCreateVariation = (id: number) => useEndMutation(id, (input: VariationInput) => api<VariationDto>(`/api/jobs/${id}/variations`, { method: 'POST', body: input }));
export const useSendVariation = (id: number) => useEndMutation(id, (variationId: number) => api<VariationDto>(`/api/jobs/${id}/variations/${variationId}/send`, { method: 'POST', body: {} }));
export const useWithdrawVariation = (id: number) => useEndMutation(id, (variationId: number) => api<VariationDto>(`/api/jobs/${id}/variations/${variationId}/withdraw`, { method: 'POST', body: {} }));
