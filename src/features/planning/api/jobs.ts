import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type {
  BookingInput, BookingPreview, CreateJobInput, JobDetail, SessionDoneInput, SessionDoneResult, UpdateJobInput,
} from '@shared/schemas/planning';
import { api } from '@/lib/api';
import { planningKeys } from './planning-keys';

export const jobQueryOptions = (id: number) =>
  queryOptions({
    queryKey: planningKeys.job(id),
    queryFn: ({ signal }) => api<JobDetail>(`/api/jobs/${id}`, { signal }),
  });

export function useJob(id: number) {
  return useQuery({ ...jobQueryOptions(id), enabled: id > 0 });
}

/** After any change to a job: keep the detail the server answered with and refresh the board and lists. */
function useSettle() {
  const qc = useQueryClient();
  return async (job: JobDetail) => {
    qc.setQueryData(planningKeys.job(job.id), job);
    await qc.invalidateQueries({ queryKey: planningKeys.all });
  };
}

export function useCreateJob() {
  const settle = useSettle();
  return useMutation({
    mutationFn: (input: CreateJobInput) => api<JobDetail>('/api/jobs', { method: 'POST', body: input }),
    onSuccess: settle,
  });
}

export function useUpdateJob(id: number) {
  const settle = useSettle();
  return useMutation({
    mutationFn: (input: UpdateJobInput) => api<JobDetail>(`/api/jobs/${id}`, { method: 'PATCH', body: input }),
    onSuccess: settle,
  });
}

/** What a booking would do; nothing is written, so nothing is invalidated. */
export function usePreviewBooking() {
  return useMutation({
    mutationFn: ({ id, ...input }: BookingInput & { id: number }) => api<BookingPreview>(`/api/jobs/${id}/booking/preview`, { method: 'POST', body: input }),
  });
}

export function useBookJob() {
  const settle = useSettle();
  return useMutation({
    mutationFn: ({ id, ...input }: BookingInput & { id: number }) => api<JobDetail>(`/api/jobs/${id}/booking`, { method: 'POST', body: input }),
    onSuccess: settle,
  });
}

export function useCancelJob() {
  const settle = useSettle();
  return useMutation({
    mutationFn: (id: number) => api<JobDetail>(`/api/jobs/${id}/cancel`, { method: 'POST', body: {} }),
    onSuccess: settle,
  });
}

export function useMarkDone() {
  const settle = useSettle();
  return useMutation({
    mutationFn: ({ jobId, sessionId, ...input }: SessionDoneInput & { jobId: number; sessionId: number }) =>
      api<SessionDoneResult>(`/api/jobs/${jobId}/sessions/${sessionId}/done`, { method: 'POST', body: input }),
    onSuccess: (result) => settle(result.job),
  });
}

/** A photo taken at the bench, added to the photos of the job's piece with a caption naming the session. */
export function useAddJobPhoto() {
  return useMutation({
    mutationFn: ({ jobId, file, caption }: { jobId: number; file: File; caption: string }) => {
      const form = new FormData();
      form.append('photos', file);
      form.append('captions', caption.slice(0, 200));
      return api<unknown>(`/api/jobs/${jobId}/photos`, { method: 'POST', body: form });
    },
  });
}
