import { hash, verify } from '@node-rs/argon2';
import { randomBytes } from 'node:crypto';

export const hashPassword = (password: string) => hash(password);

// Checked against when there is no account (or no password yet), so an unknown address takes as long
// to refuse as a wrong password and sign-in time does not reveal which accounts exist.
let dummyHash: Promise<string> | null = null;

export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
  dummyHash ??= hash(randomBytes(24).toString('base64url'));
  try {
    const ok = await verify(passwordHash ?? (await dummyHash), password);
    return ok && passwordHash !== null;
  } catch {
    return false;
  }
}
