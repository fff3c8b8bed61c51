import type passport from 'passport';
type Authenticator = passport.Authenticator;
import { Strategy as LocalStrategy } from 'passport-local';
import type { AppDeps } from '../deps';
import { verifyStaffPassword } from './auth.service';

export const STAFF_STRATEGY = 'staff-password';

/** Staff sign in with e-mail and password; the service does throttling and auditing. */
export function configureStaffStrategy(auth: Authenticator, deps: AppDeps): void {
  auth.use(
    STAFF_STRATEGY,
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', passReqToCallback: true, session: false }, (req, email, password, done) => {
      verifyStaffPassword(deps, email, password, req.ip ?? 'unknown').then(
        (user) => done(null, user),
        (err) => done(err),
      );
    }),
  );
}
