import { hash, verify } from "@node-rs/argon2";

// Argon2id with the OWASP Password Storage Cheat Sheet's first option: m = 19 MiB, t = 2, p = 1
// (about 15 ms a hash on this machine, STACK-NOTES §6). @node-rs/argon2 defaults to Argon2id.
const ARGON2_OPTIONS = { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32 } as const;

/** An Argon2id PHC string for `password`. */
export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

/**
 * Whether `password` matches `passwordHash`. A missing hash (an account that never set a password) still
 * costs one hash, so timing does not tell such accounts apart.
 */
export async function verifyPassword(passwordHash: string | null, password: string): Promise<boolean> {
  if (!passwordHash) {
    await hash(password, ARGON2_OPTIONS);
    return false;
  }
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}

let dummyHash: Promise<string> | undefined;

/** Spends the time of one verification, for sign-ins to unknown e-mail addresses. */
export async function verifyAgainstDummy(password: string): Promise<void> {
  dummyHash ??= hash("not-a-real-password-at-all", ARGON2_OPTIONS);
  await verify(await dummyHash, password).catch(() => false);
}
