/**
 * The owner's pages (price list, supplier file, settings, finishing systems, species, audit log), each loaded on
 * demand so the first load stays small: the price history brings recharts only when it is opened.
 */
import type { ComponentType } from 'react';
import type { RouteObject } from 'react-router-dom';
import type { Role } from '@shared/schemas/auth';
import { paths } from '@/config/paths';
import { RequireRole } from './require-role';

/** Who may open each page; the server enforces the same on every route it calls. */
export const OWNER_PAGE_ROLES = {
  priceList: ['owner', 'estimator', 'sales', 'workshop'],
  priceFile: ['owner'],
  settings: ['owner'],
  finishing: ['owner', 'estimator'],
  auditLog: ['owner'],
} as const satisfies Record<string, readonly Role[]>;

function guarded(roles: readonly Role[], load: () => Promise<{ Component: ComponentType }>): RouteObject['lazy'] {
  return async () => {
    const { Component: Page } = await load();
    return {
      Component: () => (
        <RequireRole roles={roles}>
          <Page />
        </RequireRole>
      ),
    };
  };
}

export const ownerRoutes: RouteObject[] = [
  { path: paths.priceList, lazy: guarded(OWNER_PAGE_ROLES.priceList, () => import('@/features/price-list/routes/price-list').then((m) => ({ Component: m.PriceListPage }))) },
  { path: paths.priceFile, lazy: guarded(OWNER_PAGE_ROLES.priceFile, () => import('@/features/price-list/routes/price-file')) },
  { path: paths.materialHistory, lazy: guarded(OWNER_PAGE_ROLES.priceList, () => import('@/features/price-list/routes/material-history')) },
  { path: paths.settings, lazy: guarded(OWNER_PAGE_ROLES.settings, () => import('@/features/settings/routes/settings')) },
  { path: paths.finishingSystems, lazy: guarded(OWNER_PAGE_ROLES.finishing, () => import('@/features/finishing/routes/systems')) },
  { path: paths.finishingSystem, lazy: guarded(OWNER_PAGE_ROLES.finishing, () => import('@/features/finishing/routes/system-editor')) },
  { path: paths.species, lazy: guarded(OWNER_PAGE_ROLES.finishing, () => import('@/features/finishing/routes/species')) },
  { path: paths.auditLog, lazy: guarded(OWNER_PAGE_ROLES.auditLog, () => import('@/features/audit/routes/audit-log')) },
];
