import passportModule from 'passport';
import { Strategy as LocalStrategy } from 'passport-local';
import type { DataSource } from 'typeorm';
import { User } from '../db/entities/index';
import { decoyHash, verifyPassword } from './password';
import './session-user';

/**
 * passport with the local strategy (e-mail and password). The session keeps only the person's
 * id; every request loads them again, and an unknown or deactivated person is signed out.
 * Verification compares against a decoy hash when the e-mail is unknown, so both failures take
 * about as long.
 */
export type PassportInstance = InstanceType<typeof passportModule.Passport>;

export function createPassport(dataSource: DataSource, bcryptCost: number): PassportInstance {
  const passport = new passportModule.Passport();
  let decoy: Promise<string> | null = null;

  passport.use(
    new LocalStrategy({ usernameField: 'email', passwordField: 'password', session: false }, (email, password, done) => {
      (async () => {
        const user = await dataSource.getRepository(User).findOneBy({ email: email.trim().toLowerCase() });
        if (!user || !user.passwordHash) {
          decoy ??= decoyHash(bcryptCost);
          await verifyPassword(password, await decoy);
          return false as const;
        }
        return (await verifyPassword(password, user.passwordHash)) ? user : (false as const);
      })().then(
        (user) => done(null, user),
        (error: unknown) => done(error),
      );
    }),
  );

  passport.serializeUser((user, done) => done(null, user.id));
  passport.deserializeUser((id: unknown, done) => {
    if (typeof id !== 'number') return done(null, false);
    dataSource
      .getRepository(User)
      .findOneBy({ id })
      .then(
        (user) => done(null, user && user.active ? user : false),
        (error: unknown) => done(error),
      );
  });
  return passport;
}
