import { PERMISSION_NAMES, can, type Permission } from '@shared/roles';
import { useMe } from './me';

/**
 * What the signed-in user may do, one flag per permission of `shared/roles.ts`. The server refuses the others; the
 * client hides their controls.
 */
export function useCan(): Record<Permission, boolean> {
  const role = useMe().data?.role;
  return Object.fromEntries(PERMISSION_NAMES.map((p) => [p, can(role, p)])) as Record<Permission, boolean>;
}
