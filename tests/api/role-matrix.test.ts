/**
 * Every API route against every role and the signed-out caller. Routes join this matrix by declaring their access
 * with secureRouter: a signed-out caller gets 401, a role the route does not name gets 403, a named role gets through
 * the guard (any other status: 2xx, or 400/404 for the placeholder ids and empty bodies used here).
 */
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLES, type Role } from '../../shared/schemas/auth';
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
    expect(routes.every((r) => r.access === 'public' || r.access === 'signed-in' || r.access.length > 0)).toBe(true);
  });

  for (const route of guarded) {
    const label = `${route.method.toUpperCase()} ${route.path}`;
    it(`${label}: signed out → 401`, async () => {
      const res = await call(undefined, route.method, route.path);
      expect(res.status).toBe(401);
      expect(res.headers['content-type']).toMatch(/problem\+json/);
    });
    for (const role of ROLES) {
      const allowed = route.access === 'signed-in' || (route.access as readonly Role[]).includes(role);
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
