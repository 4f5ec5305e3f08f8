import bcrypt from 'bcryptjs';

/** bcrypt (bcryptjs) hashing; the cost comes from the configuration (12 in production). */
export function hashPassword(password: string, cost: number): Promise<string> {
  return bcrypt.hash(password, cost);
}

export function verifyPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

/**
 * A hash to compare against when the e-mail is unknown or has no password yet, so a failed
 * sign-in takes about as long whether or not the account exists.
 */
export function decoyHash(cost: number): Promise<string> {
  return bcrypt.hash('decoy password that is never accepted', cost);
}
