import type { Knex } from "knex";
import type { Role } from "@/lib/auth/permissions";
import { db } from "../index";
import { readJoinedTo, type JoinedRead } from "./joined-read";

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

/** A live token's owner as a request acts for them. */
export interface TokenUse {
  tokenId: string;
  user: { id: string; email: string; name: string; role: Role };
}

/** The live token with this hash whose owner is active: at most one row, columns named `h_*` (see joined-read.ts). */
function liveTokenHead(knex: Knex, tokenHash: string): Knex.QueryBuilder {
  return knex("api_tokens as t")
    .join("auth_user as u", "u.id", "t.user_id")
    .select("t.id as h_token_id", "t.last_used_at as h_token_last_used_at", "u.id as h_user_id", "u.email as h_user_email", "u.name as h_user_name", "u.role as h_user_role")
    .where("t.token_hash", tokenHash)
    .whereNull("t.revoked_at")
    .andWhere("u.status", "active");
}

/** Records the use, at most once a minute per token (a bench script polling every second writes once a minute). */
async function touchToken(head: Record<string, any>): Promise<TokenUse> {
  const lastUsedAt = head.h_token_last_used_at as Date | null;
  if (!lastUsedAt || Date.now() - new Date(lastUsedAt).getTime() > 60_000) {
    await db()("api_tokens").where({ id: head.h_token_id }).update({ last_used_at: db().fn.now() });
  }
  return { tokenId: head.h_token_id, user: { id: head.h_user_id, email: head.h_user_email, name: head.h_user_name, role: head.h_user_role } };
}

/**
 * The live token with this hash and its active owner, recording the use (at most once a minute per token).
 * @returns null for an unknown or revoked token or a disabled owner
 */
export async function useApiToken(tokenHash: string): Promise<TokenUse | null> {
  const head = await liveTokenHead(db(), tokenHash).first();
  return head ? touchToken(head) : null;
}

/**
 * {@link useApiToken} and `read` in one statement: the read's rows are joined to the token's row, so they are
 * read only for a live token of an active owner. The caller still checks the owner's permission before using them.
 * @returns null for an unknown or revoked token or a disabled owner (nothing is read then)
 */
export async function useApiTokenWith<T>(tokenHash: string, read: JoinedRead<T>): Promise<(TokenUse & { data: T }) | null> {
  const found = await readJoinedTo(liveTokenHead(db(), tokenHash), read);
  return found ? { ...(await touchToken(found.head)), data: found.data } : null;
}
