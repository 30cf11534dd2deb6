/** The one definition of who may do what (shared/roles.ts) and the checks every guard, page and hook goes through. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { allows, can, isPermission, PERMISSION_NAMES, PERMISSIONS, ROLES, rolesFor, type Access } from '../../shared/roles';

const role = fc.constantFrom(...ROLES);
const permission = fc.constantFrom(...PERMISSION_NAMES);
const access = fc.oneof(permission, fc.constantFrom<Access>('signed-in', 'public'));

describe('roles and permissions', () => {
  it('give every permission at least one known role, each once', () => {
    for (const p of PERMISSION_NAMES) {
      const roles = rolesFor(p);
      expect(roles.length, p).toBeGreaterThan(0);
      expect(new Set(roles).size, p).toBe(roles.length);
      for (const r of roles) expect(ROLES, p).toContain(r);
    }
  });

  it('let the owner do everything', () => {
    for (const p of PERMISSION_NAMES) expect(can('owner', p), p).toBe(true);
  });

  it('can(role, p) holds exactly for the roles the permission lists', () => {
    fc.assert(fc.property(role, permission, (r, p) => can(r, p) === (PERMISSIONS[p] as readonly string[]).includes(r)));
  });

  it('nobody signed out holds a permission or passes anything but public', () => {
    fc.assert(
      fc.property(access, (a) => {
        expect(allows(a, undefined)).toBe(a === 'public');
        expect(allows(a, null)).toBe(a === 'public');
      }),
    );
  });

  it('a signed-in role passes public and signed-in, and a permission only when it holds it', () => {
    fc.assert(fc.property(role, access, (r, a) => allows(a, r) === (a === 'public' || a === 'signed-in' || can(r, a))));
  });

  it('knows its permission names and nothing else', () => {
    for (const p of PERMISSION_NAMES) expect(isPermission(p)).toBe(true);
    for (const other of ['owner', 'signed-in', 'public', 'toString', '__proto__', '', 42, null, ['owner']]) expect(isPermission(other)).toBe(false);
  });
});
