import "server-only";
import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { cache } from "react";
import type { Session } from "lucia";
import type { CurrentUser } from "./current-user-type";
import { lucia, SESSION_COOKIE_NAME } from "./lucia";
import { validateSessionId } from "./session-user";

/** The session behind the request's cookie, validated once per request. */
export const getCurrentSession = cache(async (): Promise<{ session: Session; user: CurrentUser } | { session: null; user: null }> => {
  const store = await cookies();
  const result = await validateSessionId(store.get(SESSION_COOKIE_NAME)?.value);
  if (!result.session && store.has(SESSION_COOKIE_NAME)) {
    // Drop a dead cookie where Next allows it (actions, route handlers); a page render may not set cookies.
    try {
      const blank = lucia().createBlankSessionCookie();
      store.set(blank.name, blank.value, blank.attributes);
    } catch {
      // Rendering a server component: the stale cookie stays until the next action or sign-in replaces it.
    }
  }
  return result;
});

/** The signed-in user, or null. Reads the session cookie, extends the session on use, ignores disabled users. */
export const getCurrentUser = cache(async (): Promise<CurrentUser | null> => (await getCurrentSession()).user);

/**
 * The signed-in user, for pages; redirects to the sign-in page when nobody is signed in.
 * @param nextPath where to come back to after signing in, e.g. "/projects/42" (a same-site path)
 */
export async function requireUser(nextPath?: string): Promise<CurrentUser> {
  const user = await getCurrentUser();
  if (!user) redirect(nextPath ? `/sign-in?next=${encodeURIComponent(nextPath)}` : "/sign-in");
  return user;
}

/** Sets the session cookie for a new session (server actions and route handlers only). */
export async function setSessionCookie(sessionId: string): Promise<void> {
  const cookie = lucia().createSessionCookie(sessionId);
  (await cookies()).set(cookie.name, cookie.value, cookie.attributes);
}

/** Clears the session cookie (server actions and route handlers only). */
export async function clearSessionCookie(): Promise<void> {
  const cookie = lucia().createBlankSessionCookie();
  (await cookies()).set(cookie.name, cookie.value, cookie.attributes);
}
