import argon2 from 'argon2';
import bcrypt from 'bcryptjs';

/**
 * argon2id with the first configuration of the OWASP Password Storage Cheat Sheet ("Argon2id with a minimum
 * configuration of 19 MiB of memory, an iteration count of 2, and 1 degree of parallelism").
 * Unlike bcrypt, it reads the whole password: nothing past 72 bytes is silently dropped.
 */
export const ARGON2_OPTIONS = {
  type: argon2.argon2id,
  memoryCost: 19 * 1024,
  timeCost: 2,
  parallelism: 1,
} as const;

const isBcryptHash = (hash: string) => /^\$2[aby]\$/.test(hash);

export const hashPassword = (password: string) => argon2.hash(password, ARGON2_OPTIONS);

// Compared against when the e-mail is unknown, so that answer costs one argon2id verification like the others.
let dummyHash: Promise<string> | undefined;
const dummy = () => (dummyHash ??= hashPassword('fourpoint-no-such-user'));

export interface PasswordCheck {
  ok: boolean;
  /** The stored hash is bcrypt (from before argon2id) or weaker than ARGON2_OPTIONS: store a new one. */
  needsRehash: boolean;
}

export async function verifyPassword(password: string, hash: string | undefined): Promise<PasswordCheck> {
  if (hash === undefined) {
    await argon2.verify(await dummy(), password);
    return { ok: false, needsRehash: false };
  }
  if (isBcryptHash(hash)) return { ok: await bcrypt.compare(password, hash), needsRehash: true };
  try {
    const ok = await argon2.verify(hash, password);
    return { ok, needsRehash: ok && argon2.needsRehash(hash, ARGON2_OPTIONS) };
  } catch {
    // A stored value that is no hash at all never matches.
    return { ok: false, needsRehash: false };
  }
}
