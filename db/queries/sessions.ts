import { db } from "../index";

// lucia creates, validates and deletes sessions itself; these are the extra reads and writes it has no call for.

export interface SessionSummary {
  id: string;
  createdAt: Date;
  expiresAt: Date;
  ip: string | null;
  userAgent: string | null;
}

/** A user's unexpired sessions, newest first. */
export async function listSessions(userId: string): Promise<SessionSummary[]> {
  const rows = await db()("user_session")
    .select("id", "created_at", "expires_at", "ip", "user_agent")
    .where({ user_id: userId })
    .andWhere("expires_at", ">", db().fn.now())
    .orderBy("created_at", "desc");
  return rows.map((r) => ({ id: r.id, createdAt: r.created_at, expiresAt: r.expires_at, ip: r.ip, userAgent: r.user_agent }));
}

/** Ends every session of a user except `keepSessionId` (when given). @returns how many were ended */
export async function deleteOtherSessions(userId: string, keepSessionId: string | null): Promise<number> {
  const q = db()("user_session").where({ user_id: userId });
  if (keepSessionId) q.whereNot({ id: keepSessionId });
  return q.delete();
}
