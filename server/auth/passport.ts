import type { Request } from 'express';
import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Role } from '@shared/schemas/auth';
import { lookupWorkshop, runAsWorkshop } from '../db/workshop-context';
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
      /** The workshop the user belongs to: every request of theirs runs under it (row-level security). */
      workshopId: number;
    }
  }
}

let configured = false;

/** An unknown or deactivated user is signed out: their session no longer names anyone. */
async function readUser(id: number): Promise<UserEntry> {
  const workshopId = await lookupWorkshop(User.sequelize!, 'user', id);
  if (workshopId === null) return false;
  const user = await runAsWorkshop(workshopId, () => User.findByPk(id, { attributes: ['id', 'email', 'name', 'role', 'active'] }));
  return user && user.active ? { id: user.id, email: user.email, name: user.name, role: user.role, workshopId } : false;
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
        (user) => {
          // The right password for an address not confirmed yet (a sign-up whose link was not opened): refused, and
          // the sign-in route says why. Only someone who knows the password learns that.
          if (user && user.emailConfirmedAt === null) return done(null, false, { message: 'unconfirmed' });
          done(null, user ? { id: user.id, email: user.email, name: user.name, role: user.role, workshopId: user.workshopId } : false);
        },
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
