import type { Knex } from "knex";
import { db } from "../index";

export async function createPasswordReset(input: { id: string; userId: string; tokenHash: string; expiresAt: Date; ip: string | null }): Promise<void> {
  await db()("password_resets").insert({ id: input.id, user_id: input.userId, token_hash: input.tokenHash, expires_at: input.expiresAt, ip: input.ip });
}

/** How many reset links the user was sent within the last `windowSeconds`. */
export async function countRecentPasswordResets(userId: string, windowSeconds: number): Promise<number> {
  const [{ count }] = await db()("password_resets")
    .where({ user_id: userId })
    .andWhere("created_at", ">", db().raw("now() - make_interval(secs => ?)", [windowSeconds]))
    .count<{ count: string }[]>({ count: "*" });
  return Number(count);
}

/** The open (unused, unexpired) reset with this token hash and its active user, or null. */
export async function getOpenPasswordReset(
  tokenHash: string,
  trx: Knex | Knex.Transaction = db(),
  lock = false,
): Promise<{ id: string; userId: string; email: string; name: string } | null> {
  const q = trx("password_resets as r")
    .join("auth_user as u", "u.id", "r.user_id")
    .select("r.id", "r.user_id", "u.email", "u.name")
    .where("r.token_hash", tokenHash)
    .whereNull("r.used_at")
    .andWhere("r.expires_at", ">", trx.fn.now())
    .andWhere("u.status", "active")
    .first();
  if (lock) q.forUpdate("r");
  const row = await q;
  return row ? { id: row.id, userId: row.user_id, email: row.email, name: row.name } : null;
}

/** Marks every open reset of the user used (the one just taken and any older links). */
export async function closePasswordResets(userId: string, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("password_resets").where({ user_id: userId }).whereNull("used_at").update({ used_at: trx.fn.now() });
}
