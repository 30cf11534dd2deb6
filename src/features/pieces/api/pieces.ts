import type { z } from 'zod';
import { keepPreviousData, queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { Page } from '@shared/schemas/auth';
import type { Piece, PieceInput, PieceListQuerySchema } from '@shared/schemas/customers';
import { api, toQuery } from '@/lib/api';

/** The list's search, filters, sort and page (every field optional; the server fills defaults). */
export type PieceListQueryInput = Partial<z.output<typeof PieceListQuerySchema>>;

export const pieceKeys = {
  all: ['pieces'] as const,
  lists: () => ['pieces', 'list'] as const,
  list: (query: PieceListQueryInput) => ['pieces', 'list', query] as const,
  detail: (id: number) => ['pieces', 'detail', id] as const,
};

export const piecesQueryOptions = (query: PieceListQueryInput) =>
  queryOptions({
    queryKey: pieceKeys.list(query),
    queryFn: ({ signal }) => api<Page<Piece>>(`/api/pieces${toQuery(query)}`, { signal }),
    placeholderData: keepPreviousData,
  });

export const pieceQueryOptions = (id: number) =>
  queryOptions({
    queryKey: pieceKeys.detail(id),
    queryFn: ({ signal }) => api<Piece>(`/api/pieces/${id}`, { signal }),
  });

export function usePieces(query: PieceListQueryInput) {
  return useQuery(piecesQueryOptions(query));
}

export function usePiece(id: number | undefined) {
  return useQuery({ ...pieceQueryOptions(id ?? 0), enabled: id !== undefined && id > 0 });
}

export function useCreatePiece() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: PieceInput) => api<Piece>('/api/pieces', { method: 'POST', body: input }),
    onSuccess: async () => {
      await qc.invalidateQueries({ queryKey: pieceKeys.lists() });
      await qc.invalidateQueries({ queryKey: ['customers'] });
    },
  });
}

export function useUpdatePiece() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...input }: Partial<PieceInput> & { id: number }) => api<Piece>(`/api/pieces/${id}`, { method: 'PATCH', body: input }),
    onSuccess: (piece) => {
      qc.setQueryData(pieceKeys.detail(piece.id), piece);
      return qc.invalidateQueries({ queryKey: pieceKeys.lists() });
    },
  });
}
