import passport from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { Role } from '@shared/schemas/auth';
import { User } from '../models';
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

/** Sets up passport-local once: e-mail and password, the user's id in the session, re-read on every request. */
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
  passport.deserializeUser((id: string, done) => {
    User.findByPk(Number(id)).then(
      // An unknown or deactivated user is signed out: their session no longer names anyone.
      (user) => done(null, user && user.active ? { id: user.id, email: user.email, name: user.name, role: user.role } : false),
      (err: unknown) => done(err),
    );
  });
  return passport;
}
