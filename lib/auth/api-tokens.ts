import { generateIdFromEntropySize } from "lucia";
import { createApiTokenRow, revokeApiTokenRow, useApiToken, useApiTokenWith, type ApiTokenSummary } from "@/db/queries/api-tokens";
import type { JoinedRead } from "@/db/queries/joined-read";
import { recordAudit } from "@/db/queries/audit";
import { NotFoundError } from "@/lib/errors";
import type { CurrentUser } from "./current-user-type";
import { hashSecretToken, newSecretToken } from "./secret-token";

/** Every token starts with this, so a leaked one is recognisable in logs and secret scanners. */
export const API_TOKEN_PREFIX = "tbk_";

/**
 * Creates a named API token for `userId`. The secret is returned here once and stored only as its SHA-256.
 * @returns the plain token (show it once) and its summary
 */
export async function createApiToken(input: { userId: string; name: string; ip?: string | null; actorId?: string }): Promise<{ token: string; summary: ApiTokenSummary }> {
  const token = newSecretToken(API_TOKEN_PREFIX);
  const summary = await createApiTokenRow({
    id: generateIdFromEntropySize(10),
    userId: input.userId,
    name: input.name,
    tokenHash: hashSecretToken(token),
    tokenPrefix: token.slice(0, API_TOKEN_PREFIX.length + 6),
  });
  await recordAudit({
    actorId: input.actorId ?? input.userId,
    action: "token.created",
    entityType: "api_token",
    entityId: summary.id,
    detail: { name: input.name, ownerId: input.userId },
    ip: input.ip,
  });
  return { token, summary };
}

/**
 * Revokes one of the user's own tokens.
 * @throws NotFoundError when the user has no live token with that id
 */
export async function revokeApiToken(input: { userId: string; tokenId: string; ip?: string | null }): Promise<void> {
  const name = await revokeApiTokenRow(input.userId, input.tokenId);
  if (name === null) throw new NotFoundError("That API token");
  await recordAudit({ actorId: input.userId, action: "token.revoked", entityType: "api_token", entityId: input.tokenId, detail: { name }, ip: input.ip });
}

function plausibleToken(token: string): boolean {
  return token.startsWith(API_TOKEN_PREFIX) && token.length <= 200;
}

/** The active owner of a live token (the use is recorded); null for anything else. */
export async function authenticateApiToken(token: string): Promise<CurrentUser | null> {
  if (!plausibleToken(token)) return null;
  const found = await useApiToken(hashSecretToken(token));
  return found?.user ?? null;
}

/**
 * {@link authenticateApiToken} with `read` made in the same statement as the lookup.
 * @returns null for anything but a live token of an active owner (and then nothing was read)
 */
export async function authenticateApiTokenWith<T>(token: string, read: JoinedRead<T>): Promise<{ user: CurrentUser; data: T } | null> {
  if (!plausibleToken(token)) return null;
  const found = await useApiTokenWith(hashSecretToken(token), read);
  return found ? { user: found.user, data: found.data } : null;
}
