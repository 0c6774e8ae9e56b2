import type { Session, User } from "lucia";
import { touchLastSeen } from "@/db/queries/users";
import type { CurrentUser } from "./current-user-type";
import { lucia } from "./lucia";

/** How fresh "last seen" is kept: within this, a request does not write it again. */
export const LAST_SEEN_GRANULARITY_MS = 60_000;

/**
 * Validates a session id (extending the session when more than half its life has passed) and marks the user seen,
 * writing only when the stored last-seen time (read with the session) is a minute old or more.
 * @returns the session and its user, or nulls for an unknown or expired session or a disabled user
 */
export async function validateSessionId(sessionId: string | null | undefined): Promise<{ session: Session; user: CurrentUser } | { session: null; user: null }> {
  if (!sessionId) return { session: null, user: null };
  const result = await lucia().validateSession(sessionId);
  if (!result.session || !isActive(result.user)) return { session: null, user: null };
  const lastSeenAt = result.user.lastSeenAt;
  if (!lastSeenAt || Date.now() - new Date(lastSeenAt).getTime() >= LAST_SEEN_GRANULARITY_MS) await touchLastSeen(result.user.id);
  return { session: result.session, user: toCurrentUser(result.user) };
}

function isActive(user: User): boolean {
  return user.status === "active";
}

function toCurrentUser(user: User): CurrentUser {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}
