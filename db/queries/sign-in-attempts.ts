import { db } from "../index";

/** Records one sign-in attempt for throttling. */
export async function recordSignInAttempt(input: { email: string; ip: string | null; succeeded: boolean }): Promise<void> {
  await db()("sign_in_attempts").insert({ email: input.email, ip: input.ip, succeeded: input.succeeded });
}

/**
 * Seconds until an account may try again: null while it has fewer than `limit` failures within `windowSeconds`
 * since its last successful sign-in. The wait ends when the `limit`-th newest failure leaves the window.
 */
export async function accountRetryAfterSeconds(email: string, limit: number, windowSeconds: number, fromIp?: string | null): Promise<number | null> {
  const row = await db()
    .select(db().raw("ceil(extract(epoch from (created_at + make_interval(secs => ?) - now())))::int as retry", [windowSeconds]))
    .from("sign_in_attempts")
    .where({ email, succeeded: false })
    .modify((q) => {
      // Counted per address when one is given: failures elsewhere do not lock this address out.
      if (fromIp === null) q.whereNull("ip");
      else if (fromIp !== undefined) q.where({ ip: fromIp });
    })
    .andWhere("created_at", ">", db().raw("now() - make_interval(secs => ?)", [windowSeconds]))
    .andWhere(
      "created_at",
      ">",
      db().raw("coalesce((select max(created_at) from sign_in_attempts where email = ? and succeeded), '-infinity')", [email]),
    )
    .orderBy("created_at", "desc")
    .offset(limit - 1)
    .first();
  return row ? Math.max(1, row.retry) : null;
}

/** Whether the account has a live session opened from this address: a device its owner signed in from. */
export async function isKnownAddress(email: string, ip: string): Promise<boolean> {
  const row = await db()("user_session as s")
    .join("auth_user as u", "u.id", "s.user_id")
    .where("u.email", email)
    .andWhere("s.ip", ip)
    .andWhere("s.expires_at", ">", db().fn.now())
    .first("s.id");
  return Boolean(row);
}

/**
 * Seconds until a client address may try again: null while it has fewer than `limit` failures (over any
 * accounts) within `windowSeconds`. A success from the address does not reset it.
 */
export async function ipRetryAfterSeconds(ip: string, limit: number, windowSeconds: number): Promise<number | null> {
  const row = await db()
    .select(db().raw("ceil(extract(epoch from (created_at + make_interval(secs => ?) - now())))::int as retry", [windowSeconds]))
    .from("sign_in_attempts")
    .where({ ip, succeeded: false })
    .andWhere("created_at", ">", db().raw("now() - make_interval(secs => ?)", [windowSeconds]))
    .orderBy("created_at", "desc")
    .offset(limit - 1)
    .first();
  return row ? Math.max(1, row.retry) : null;
}

/** Drops attempts older than `olderThanSeconds` (the table only needs the throttling window). */
export async function pruneSignInAttempts(olderThanSeconds: number): Promise<number> {
  return db()("sign_in_attempts").where("created_at", "<", db().raw("now() - make_interval(secs => ?)", [olderThanSeconds])).delete();
}
