import type { Request } from 'express';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Role } from '@shared/schemas/auth';
import { User } from '../models';
import { cachesOf, type UserEntry } from '../services/shared-caches';
import { verifyCredentials } from '../services/users';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface User {
      id: number;
      email: string;
      name: string;
      role: Role;
    }
  }
}

let configured = false;

/** An unknown or deactivated user is signed out: their session no longer names anyone. */
async function readUser(id: number): Promise<UserEntry> {
  const user = await User.findByPk(id, { attributes: ['id', 'email', 'name', 'role', 'active'] });
  return user && user.active ? { id: user.id, email: user.email, name: user.name, role: user.role } : false;
}

/**
 * Sets up passport-local once: e-mail and password, the user's id in the session, the user read on each request
 * from the app's shared caches (dropped on every instance when the user changes) or from the database.
 */
export function configurePassport(): typeof passport {
  if (configured) return passport;
  configured = true;
  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password' }, (email, password, done) => {
      verifyCredentials(email, password).then(
        (user) => done(null, user ? { id: user.id, email: user.email, name: user.name, role: user.role } : false),
        (err: unknown) => done(err),
      );
    }),
  );
  passport.serializeUser((user, done) => done(null, String(user.id)));
  passport.deserializeUser((req: Request, id: string, done: (err: unknown, user?: Express.User | false) => void) => {
    const caches = cachesOf(req);
    const userId = Number(id);
    (caches ? caches.user(userId, readUser) : readUser(userId)).then(
      (user) => done(null, user),
      (err: unknown) => done(err),
    );
  });
  return passport;
}
