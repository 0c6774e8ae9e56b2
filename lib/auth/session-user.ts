import type { Session, User } from "lucia";
import { touchLastSeen } from "@/db/queries/users";
import type { CurrentUser } from "./current-user-type";
import { lucia } from "./lucia";

/**
 * Validates a session id (extending the session when more than half its life has passed).
 * @returns the session and its user, or nulls for an unknown or expired session or a disabled user
 */
export async function validateSessionId(sessionId: string | null | undefined): Promise<{ session: Session; user: CurrentUser } | { session: null; user: null }> {
  if (!sessionId) return { session: null, user: null };
  const result = await lucia().validateSession(sessionId);
  if (!result.session || !isActive(result.user)) return { session: null, user: null };
  await touchLastSeen(result.user.id);
  return { session: result.session, user: toCurrentUser(result.user) };
}

function isActive(user: User): boolean {
  return user.status === "active";
}

function toCurrentUser(user: User): CurrentUser {
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}
