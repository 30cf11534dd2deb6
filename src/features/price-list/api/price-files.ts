import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { PriceFileApplied, PriceFilePreview } from '@shared/schemas/price-list';
import { api } from '@/lib/api';
import { calcKeys, priceListKeys } from '@/lib/query-keys';

/** Sends the file; the server parses it and keeps the preview for the apply step. */
export function useUploadPriceFile() {
  return useMutation({
    mutationFn: (file: File) => {
      const form = new FormData();
      form.append('file', file, file.name);
      return api<PriceFilePreview>('/api/price-list/price-files', { method: 'POST', body: form });
    },
  });
}

/** Applies the previewed file, naming the hash of the content that was shown. */
export function useApplyPriceFile() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (preview: Pick<PriceFilePreview, 'id' | 'contentHash'>) =>
      api<PriceFileApplied>(`/api/price-list/price-files/${preview.id}/apply`, { method: 'POST', body: { contentHash: preview.contentHash } }),
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: priceListKeys.all }), qc.invalidateQueries({ queryKey: calcKeys.all })]),
  });
}
