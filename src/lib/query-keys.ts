import type { MaterialListQuery } from '@shared/schemas/price-list';

/**
 * The query keys of what several features read (the kernel's queries), in one place so that a mutation in one
 * feature can invalidate what another shows without importing it. A feature's own resources keep their key factory
 * beside their hooks in `features/<area>/api/`.
 */
export const authKeys = { me: ['auth', 'me'] as const };

export const workshopKeys = { all: ['workshop'] as const };

/** The estimator's catalog (price list, settings, warnings): dropped whenever prices or settings change. */
export const calcKeys = { all: ['calc'] as const, catalog: ['calc', 'catalog'] as const };

export const priceListKeys = {
  all: ['price-list'] as const,
  list: (query: Partial<MaterialListQuery>) => ['price-list', 'list', query] as const,
  history: (id: number) => ['price-list', 'history', id] as const,
};

/** Names the new-price mutation, so a page can tell that a price was just changed (the repricing notice). */
export const setPackPriceMutationKey = ['price-list', 'set-price'] as const;
