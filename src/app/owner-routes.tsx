/**
 * The owner's pages (price list, supplier file, settings, finishing systems, species, audit log), each loaded on
 * demand so the first load stays small: the price history brings recharts only when it is opened.
 */
import type { ComponentType } from 'react';
import type { RouteObject } from 'react-router-dom';
import type { Access } from '@shared/roles';
import { paths } from '@/config/paths';
import { RequireAccess } from './require-access';

function guarded(access: Access, load: () => Promise<{ Component: ComponentType }>): RouteObject['lazy'] {
  return async () => {
    const { Component: Page } = await load();
    return {
      Component: () => (
        <RequireAccess access={access}>
          <Page />
        </RequireAccess>
      ),
    };
  };
}

export const ownerRoutes: RouteObject[] = [
  { path: paths.priceList, lazy: guarded('readPriceList', () => import('@/app/routes/price-list').then((m) => ({ Component: m.PriceListPage }))) },
  { path: paths.priceFile, lazy: guarded('editPrices', () => import('@/app/routes/price-file')) },
  { path: paths.materialHistory, lazy: guarded('readPriceList', () => import('@/app/routes/material-history')) },
  { path: paths.settings, lazy: guarded('editSettings', () => import('@/features/settings/routes/settings')) },
  { path: paths.finishingSystems, lazy: guarded('readFinishing', () => import('@/features/finishing/routes/systems')) },
  { path: paths.finishingSystem, lazy: guarded('readFinishing', () => import('@/features/finishing/routes/system-editor')) },
  { path: paths.species, lazy: guarded('readFinishing', () => import('@/features/finishing/routes/species')) },
  { path: paths.auditLog, lazy: guarded('readAuditLog', () => import('@/features/audit/routes/audit-log')) },
];
