import { createHash, randomBytes } from "node:crypto";

/**
 * A new random secret for a link or an API token: 32 bytes (256 bits) as base64url, with an optional prefix
 * that tells people what it is when they find one in a script (e.g. "tbk_").
 */
export function newSecretToken(prefix = ""): string {
  return prefix + randomBytes(32).toString("base64url");
}

/** SHA-256 of a secret token, hex. Only this is stored; a high-entropy token needs no slow hash. */
export function hashSecretToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}
