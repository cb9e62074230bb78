import "server-only";
import crypto from "node:crypto";
import { TOKEN_PREFIX } from "@/lib/api-tokens";

/** A new secret: the prefix and 32 random bytes in base64url (256 bits: beyond guessing). */
export function newTokenSecret(): { secret: string; hash: string } {
  const secret = TOKEN_PREFIX + crypto.randomBytes(32).toString("base64url");
  return { secret, hash: tokenHashOf(secret) };
}

/** SHA-256 (hex) of the whole secret, the only form the database holds. */
export function tokenHashOf(secret: string): string {
  return crypto.createHash("sha256").update(secret).digest("hex");
}

/** The shape every secret has (prefix + 43 base64url characters); anything else is refused before a lookup. */
export const tokenSecretShape = new RegExp(`^${TOKEN_PREFIX}[A-Za-z0-9_-]{43}$`);
