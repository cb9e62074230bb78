import "server-only";
import { hash, verify } from "@node-rs/argon2";

/**
 * argon2id at the OWASP Password Storage Cheat Sheet's minimum (from memory: m = 19 MiB, t = 2,
 * p = 1). `algorithm: 2` is Argon2id in @node-rs/argon2's const enum.
 */
const params = { memoryCost: 19456, timeCost: 2, parallelism: 1, outputLen: 32, algorithm: 2 } as const;

export const MIN_PASSWORD_LENGTH = 10;

export function hashPassword(password: string): Promise<string> {
  return hash(password, params);
}

// A hash of a random string, verified against when the account does not exist, so a wrong
// e-mail address costs the same time as a wrong password (no enumeration through timing).
let dummy: Promise<string> | null = null;
export async function verifyPassword(stored: string | null | undefined, password: string): Promise<boolean> {
  if (!stored) {
    dummy ??= hash(`no-such-account-${Math.random()}`, params);
    await verify(await dummy, password).catch(() => false);
    return false;
  }
  try {
    return await verify(stored, password);
  } catch {
    return false;
  }
}
