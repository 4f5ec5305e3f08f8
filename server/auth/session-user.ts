import type { User as UserRecord } from '../db/entities/user';

// passport puts the signed-in person on `req.user`; here that is the User entity, loaded afresh
// from the database on every request (so role changes and deactivation apply at once).
declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    // eslint-disable-next-line @typescript-eslint/no-empty-object-type
    interface User extends UserRecord {}
  }
}

export type SignedInUser = UserRecord;
