import bcrypt from 'bcryptjs';

/**
 * OWASP Password Storage Cheat Sheet: bcrypt with a work factor of at least 10; we use 12.
 * Input above 72 bytes is refused by the shared passwordSchema, never truncated.
 */
export const BCRYPT_COST = 12;

export function hashPassword(password: string): Promise<string> {
  return bcrypt.hash(password, BCRYPT_COST);
}

export function checkPassword(password: string, hash: string): Promise<boolean> {
  return bcrypt.compare(password, hash);
}

let dummy: Promise<string> | null = null;
/** Compared against when the e-mail is unknown, so a miss costs the same time as a wrong password. */
export function dummyHash(): Promise<string> {
  dummy ??= bcrypt.hash('wingstage-timing-equaliser', BCRYPT_COST);
  return dummy;
}
