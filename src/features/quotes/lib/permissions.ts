import type { Role } from '@shared/schemas/auth';

/** Roles that make, send and withdraw quotes and read the outbox (the server refuses the others). */
export const SELLERS: readonly Role[] = ['owner', 'sales'];

export function canSell(role: Role | undefined): boolean {
  return role !== undefined && SELLERS.includes(role);
}
