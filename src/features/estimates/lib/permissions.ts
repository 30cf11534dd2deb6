import type { Role } from '@shared/schemas/auth';
import { useMe } from '@/features/auth/api/get-me';

/** Roles that may do each thing; the server refuses the others, the client hides the controls. */
export const ABILITIES = {
  editEstimates: ['owner', 'estimator'],
  editPieces: ['owner', 'estimator'],
  editCustomers: ['owner', 'estimator', 'sales'],
} as const satisfies Record<string, readonly Role[]>;

export type Ability = keyof typeof ABILITIES;

/** What the signed-in user may do. */
export function useCan(): Record<Ability, boolean> {
  const role = useMe().data?.role;
  const can = (a: Ability) => role !== undefined && (ABILITIES[a] as readonly Role[]).includes(role);
  return { editEstimates: can('editEstimates'), editPieces: can('editPieces'), editCustomers: can('editCustomers') };
}
