/**
 * Every API route against every role and the signed-out caller. Routes join this matrix by declaring their access
 * with secureRouter: a signed-out caller gets 401, a role without the route's permission gets 403, a role holding it
 * gets through the guard (any other status: 2xx, or 400/404 for the placeholder ids and empty bodies used here).
 * Who holds what is read from the one definition, shared/roles.ts; a route (or a page, the navigation, a hook) that
 * writes its own list of roles fails here.
 */
import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { can, isPermission, ROLES, type Role } from '../../shared/roles';
import { closeTestApp, getTestApp, signInAs, type Session } from '../helpers/app';

const { app, routes } = getTestApp();
afterAll(closeTestApp);

const sessions = {} as Record<Role, Session>;
beforeAll(async () => {
  for (const role of ROLES) sessions[role] = await signInAs(app, role);
});

/** Fills path parameters with ids that exist nowhere. */
function concrete(path: string): string {
  return path.replace(/:(\w+)/g, (_m, name: string) => (/token/i.test(name) ? 'no-such-token' : '999999'));
}

function call(s: Session | undefined, method: string, path: string) {
  const target = s ? s.agent : request(app);
  const req = (target as unknown as Record<string, (p: string) => request.Test>)[method]!(concrete(path));
  if (method !== 'get' && s) req.set('x-csrf-token', s.csrf);
  if (method !== 'get') req.send({});
  return req;
}

const guarded = routes.filter((r) => r.access !== 'public');

describe('role matrix', () => {
  it('knows the routes of the app', () => {
    expect(guarded.length).toBeGreaterThan(3);
  });

  it('names a permission of shared/roles.ts (or signed-in, or public) on every route, never a list of roles', () => {
    const own = routes.filter((r) => !(r.access === 'public' || r.access === 'signed-in' || isPermission(r.access)));
    expect(own.map((r) => `${r.method.toUpperCase()} ${r.path}: ${JSON.stringify(r.access)}`)).toEqual([]);
  });

  for (const route of guarded) {
    const label = `${route.method.toUpperCase()} ${route.path}`;
    it(`${label}: signed out → 401`, async () => {
      const res = await call(undefined, route.method, route.path);
      expect(res.status).toBe(401);
      expect(res.headers['content-type']).toMatch(/problem\+json/);
    });
    for (const role of ROLES) {
      const allowed = route.access === 'signed-in' || (isPermission(route.access) && can(role, route.access));
      it(`${label}: ${role} → ${allowed ? 'allowed' : '403'}`, async () => {
        const res = await call(sessions[role], route.method, route.path);
        if (allowed) {
          expect([401, 403]).not.toContain(res.status);
          expect(res.status).toBeLessThan(500);
        } else {
          expect(res.status).toBe(403);
          expect(JSON.parse(res.text).code).toBe('forbidden');
        }
      });
    }
  }
});

describe('unknown API paths', () => {
  it('answer 404 problem+json', async () => {
    const res = await request(app).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(JSON.parse(res.text).code).toBe('no_such_route');
  });
});

/** Every source file under a folder (TypeScript and TSX). */
function sources(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true, recursive: true })
    .filter((e) => e.isFile() && /\.tsx?$/.test(e.name))
    .map((e) => path.join(e.parentPath, e.name));
}

describe('roles are defined once', () => {
  const root = path.resolve(import.meta.dirname, '../..');
  const definition = path.join(root, 'shared/roles.ts');
  /** A literal array of role names, the way a hand-written role list looks: ['owner', 'sales'] (not T['workshop']). */
  const roleList = new RegExp(`(?<![\\w$\\])])\\[\\s*'(?:${ROLES.join('|')})'(?:\\s*,\\s*'(?:${ROLES.join('|')})')*\\s*,?\\s*\\]`, 'g');
  /** Query keys that happen to share a role's name (the workshop's record). */
  const queryKeys = path.join(root, 'src/lib/query-keys.ts');

  it('no route table, guard, page, navigation or hook writes its own list of roles', () => {
    const files = ['server', 'src', 'shared'].flatMap((d) => sources(path.join(root, d))).filter((f) => f !== definition && f !== queryKeys);
    expect(files.length).toBeGreaterThan(50);
    const found = files.flatMap((f) =>
      [...readFileSync(f, 'utf8').matchAll(roleList)].map((m) => `${path.relative(root, f)}: ${m[0]}`),
    );
    expect(found).toEqual([]);
  });

  it('the check above recognises a hand-written role list', () => {
    expect("r.get('/x', ['owner', 'sales'], handler)".match(roleList)).toEqual(["['owner', 'sales']"]);
    expect("roles: ['owner']".match(roleList)).toEqual(["['owner']"]);
    expect("queryKey: ['settings', 'workshop']".match(roleList)).toBeNull();
    expect("type Workshop = PublicQuote['workshop'];".match(roleList)).toBeNull();
  });
});
