import { randomBytes } from 'node:crypto';
import { hash, verify, type Algorithm, type Options } from '@node-rs/argon2';

// The package declares Algorithm as an ambient const enum, which isolatedModules cannot read;
// 2 is its Argon2id member.
const ARGON2ID = 2 as Algorithm;

/** OWASP Password Storage Cheat Sheet, argon2id: m = 19 MiB, t = 2, p = 1. */
const OPTIONS: Options = { algorithm: ARGON2ID, memoryCost: 19_456, timeCost: 2, parallelism: 1 };

export function hashPassword(password: string): Promise<string> {
  return hash(password, OPTIONS);
}

// A hash of a random password nobody knows, made once, for accounts that do not exist.
let dummyHash: Promise<string> | undefined;

/**
 * Whether `password` matches `passwordHash`. With no hash (unknown e-mail, or an account without a
 * password yet) it still runs one argon2 verification, so the answer takes as long either way and
 * timing does not reveal which e-mail addresses have accounts.
 */
export async function verifyPassword(passwordHash: string | null | undefined, password: string): Promise<boolean> {
  if (!passwordHash) {
    dummyHash ??= hashPassword(randomBytes(18).toString('base64url'));
    await verify(await dummyHash, password).catch(() => false);
    return false;
  }
  try {
    return await verify(passwordHash, password);
  } catch {
    return false; // a malformed stored hash never signs anyone in
  }
}
