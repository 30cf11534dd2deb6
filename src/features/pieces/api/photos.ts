import { useMutation, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { Problem } from '@shared/schemas/problem';
import type { Photo } from '@shared/schemas/customers';
import { api, ApiError, setCsrfToken } from '@/lib/api';
import { pieceKeys } from './pieces';

/** Progress of an upload, 0 to 1. */
export type UploadProgress = (fraction: number) => void;

async function csrfToken(): Promise<string> {
  const { csrfToken: token } = await api<{ csrfToken: string }>('/api/auth/csrf');
  setCsrfToken(token);
  return token;
}

/**
 * Sends several photos in one multipart request. Uses XMLHttpRequest because fetch cannot report upload progress.
 */
export async function uploadPhotos(pieceId: number, files: File[], captions: string[], onProgress?: UploadProgress): Promise<Photo[]> {
  const form = new FormData();
  files.forEach((file, i) => {
    form.append('photos', file);
    form.append('captions', captions[i] ?? '');
  });
  const token = await csrfToken();
  return new Promise<Photo[]>((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', `/api/pieces/${pieceId}/photos`);
    xhr.setRequestHeader('accept', 'application/json');
    xhr.setRequestHeader('x-csrf-token', token);
    xhr.withCredentials = true;
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress?.(e.loaded / e.total);
    };
    xhr.onerror = () => reject(new ApiError({ type: 'about:blank', title: 'Upload failed', status: 0, code: 'network', detail: 'The server could not be reached.' }));
    xhr.onload = () => {
      let body: unknown;
      try {
        body = JSON.parse(xhr.responseText);
      } catch {
        body = null;
      }
      if (xhr.status >= 200 && xhr.status < 300) {
        onProgress?.(1);
        resolve(body as Photo[]);
        return;
      }
      const p = (body ?? {}) as Partial<Problem>;
      reject(new ApiError({ type: p.type ?? 'about:blank', title: p.title ?? 'Upload failed', status: xhr.status, code: p.code ?? 'http_error', detail: p.detail, field: p.field, errors: p.errors }));
    };
    xhr.send(form);
  });
}

/** Uploads photos with a progress figure the page can show. */
export function useUploadPhotos(pieceId: number) {
  const qc = useQueryClient();
  const [progress, setProgress] = useState(0);
  const mutation = useMutation({
    mutationFn: ({ files, captions }: { files: File[]; captions: string[] }) => {
      setProgress(0);
      return uploadPhotos(pieceId, files, captions, setProgress);
    },
    onSuccess: () => qc.invalidateQueries({ queryKey: pieceKeys.detail(pieceId) }),
  });
  return { ...mutation, progress };
}

export function useUpdatePhotoCaption(pieceId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, caption }: { id: number; caption: string }) => api<Photo>(`/api/photos/${id}`, { method: 'PATCH', body: { caption } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: pieceKeys.detail(pieceId) }),
  });
}

export function useDeletePhoto(pieceId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (id: number) => api<void>(`/api/photos/${id}`, { method: 'DELETE' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: pieceKeys.detail(pieceId) }),
  });
}
