import { verifyRequestOrigin } from "lucia";
import { runJoinedRead, type JoinedRead } from "@/db/queries/joined-read";
import { authenticateApiToken, authenticateApiTokenWith } from "./api-tokens";
import type { CurrentUser } from "./current-user-type";
import { lucia } from "./lucia";
import { validateSessionId } from "./session-user";

const READ_METHODS = new Set(["GET", "HEAD", "OPTIONS"]);

/** Whether `method` only reads (GET, HEAD, OPTIONS): such requests change no state. */
export function isReadMethod(method: string): boolean {
  return READ_METHODS.has(method);
}

/**
 * Whether a cookie-authenticated request may change state: safe methods always, others only when their
 * Origin names this host (route handlers get no CSRF protection from Next, unlike form actions).
 */
export function originAllowed(request: Request): boolean {
  if (isReadMethod(request.method)) return true;
  const origin = request.headers.get("origin");
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
  return Boolean(origin && host && verifyRequestOrigin(origin, [host]));
}

/**
 * The credentials of an `Authorization: Bearer <token>` header, or null for another scheme or none. The scheme
 * name is matched case-insensitively (RFC 9110 §11.1; RFC 6750 §2.1 uses the same rule), so `bearer` works too.
 */
export function bearerToken(authorization: string): string | null {
  const match = /^bearer[ \t]+(\S+)[ \t]*$/i.exec(authorization);
  return match ? match[1] : null;
}

/**
 * Who a route handler request acts for: `Authorization: Bearer <token>` (an API token, acting with its
 * owner's role) or else the session cookie. A Bearer header is never combined with the cookie.
 * @returns the user, or null for a missing, unknown, revoked or expired credential, a disabled user, or a
 *          cookie-authenticated state-changing request from another origin
 */
export async function authenticateRequest(request: Request): Promise<CurrentUser | null> {
  const authorization = request.headers.get("authorization");
  if (authorization) {
    const token = bearerToken(authorization);
    return token ? authenticateApiToken(token) : null;
  }
  const sessionId = lucia().readSessionCookie(request.headers.get("cookie") ?? "");
  if (!sessionId || !originAllowed(request)) return null;
  return (await validateSessionId(sessionId)).user;
}

/**
 * {@link authenticateRequest} together with a read for the request: with an API token the read rides in the
 * token lookup's statement (one round trip, the busiest API reads are bench scripts with tokens); with a session
 * cookie lucia validates first and the read follows. Nothing is read without a user. The caller checks the user's
 * permission (requirePermission) before it uses the data.
 * @returns the user (null as authenticateRequest would return it) and the read's result (null without a user)
 */
export async function authenticateRequestWith<T>(request: Request, read: JoinedRead<T>): Promise<{ user: CurrentUser; data: T } | { user: null; data: null }> {
  const authorization = request.headers.get("authorization");
  if (authorization) {
    const token = bearerToken(authorization);
    const found = token ? await authenticateApiTokenWith(token, read) : null;
    return found ?? { user: null, data: null };
  }
  const user = await authenticateRequest(request);
  return user ? { user, data: await runJoinedRead(read) } : { user: null, data: null };
}
