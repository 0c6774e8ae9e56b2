import type { Knex } from "knex";
import type { Role } from "@/lib/auth/permissions";
import { db } from "../index";

/** A token as its owner sees it in a list: never the secret or its hash. */
export interface ApiTokenSummary {
  id: string;
  name: string;
  tokenPrefix: string;
  createdAt: Date;
  lastUsedAt: Date | null;
  revokedAt: Date | null;
}

function toSummary(r: Record<string, any>): ApiTokenSummary {
  return { id: r.id, name: r.name, tokenPrefix: r.token_prefix, createdAt: r.created_at, lastUsedAt: r.last_used_at, revokedAt: r.revoked_at };
}

export async function createApiTokenRow(input: { id: string; userId: string; name: string; tokenHash: string; tokenPrefix: string }): Promise<ApiTokenSummary> {
  const [row] = await db()("api_tokens")
    .insert({ id: input.id, user_id: input.userId, name: input.name, token_hash: input.tokenHash, token_prefix: input.tokenPrefix })
    .returning(["id", "name", "token_prefix", "created_at", "last_used_at", "revoked_at"]);
  return toSummary(row);
}

/** The owner's tokens, live ones first, newest first. */
export async function listApiTokens(userId: string): Promise<ApiTokenSummary[]> {
  const rows = await db()("api_tokens")
    .select("id", "name", "token_prefix", "created_at", "last_used_at", "revoked_at")
    .where({ user_id: userId })
    .orderByRaw("revoked_at is not null")
    .orderBy("created_at", "desc");
  return rows.map(toSummary);
}

/** Revokes one of the owner's live tokens. @returns the token's name, or null when the owner has no such live token */
export async function revokeApiTokenRow(userId: string, tokenId: string): Promise<string | null> {
  const [row] = await db()("api_tokens")
    .where({ id: tokenId, user_id: userId })
    .whereNull("revoked_at")
    .update({ revoked_at: db().fn.now() })
    .returning(["name"]);
  return row?.name ?? null;
}

/**
 * Revokes every live token of a user (password reset, sign out everywhere): whoever got in and made a token
 * must not keep access once the owner has locked them out.
 * @returns how many tokens were revoked
 */
export async function revokeAllApiTokenRows(userId: string, trx: Knex | Knex.Transaction = db()): Promise<number> {
  const rows = await trx("api_tokens").where({ user_id: userId }).whereNull("revoked_at").update({ revoked_at: trx.fn.now() }).returning(["id"]);
  return rows.length;
}

/**
 * The live token with this hash and its active owner, recording the use (at most once a minute per token).
 * @returns null for an unknown or revoked token or a disabled owner
 */
export async function useApiToken(tokenHash: string): Promise<{ tokenId: string; user: { id: string; email: string; name: string; role: Role } } | null> {
  const row = await db()("api_tokens as t")
    .join("auth_user as u", "u.id", "t.user_id")
    .select("t.id as token_id", "t.last_used_at", "u.id", "u.email", "u.name", "u.role")
    .where("t.token_hash", tokenHash)
    .whereNull("t.revoked_at")
    .andWhere("u.status", "active")
    .first();
  if (!row) return null;
  if (!row.last_used_at || Date.now() - new Date(row.last_used_at).getTime() > 60_000) {
    await db()("api_tokens").where({ id: row.token_id }).update({ last_used_at: db().fn.now() });
  }
  return { tokenId: row.token_id, user: { id: row.id, email: row.email, name: row.name, role: row.role } };
}
