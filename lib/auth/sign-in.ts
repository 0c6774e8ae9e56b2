import type { Session } from "lucia";
import { revokeAllApiTokenRows } from "@/db/queries/api-tokens";
import { recordAudit } from "@/db/queries/audit";
import { recordSignInAttempt } from "@/db/queries/sign-in-attempts";
import { getCredentialsByEmail } from "@/db/queries/users";
import { TooManyRequestsError, UnauthorizedError } from "@/lib/errors";
import type { CurrentUser } from "./current-user-type";
import { lucia } from "./lucia";
import { verifyAgainstDummy, verifyPassword } from "./password";
import { assertSignInAllowed } from "./throttle";

/** The one message for an unknown address, a wrong password and a disabled account alike. */
export const SIGN_IN_FAILED_MESSAGE = "That e-mail address and password do not match an active account.";

export interface RequestMeta {
  ip: string | null;
  userAgent?: string | null;
}

/**
 * Checks e-mail and password and opens a new session (a new id on every sign-in).
 * @param previousSessionId a session the client still presents; it is ended so an old id never survives sign-in
 * @returns the new session and its user
 * @throws TooManyRequestsError while throttled; UnauthorizedError with SIGN_IN_FAILED_MESSAGE otherwise
 */
export async function signIn(
  input: { email: string; password: string; previousSessionId?: string | null },
  meta: RequestMeta,
): Promise<{ session: Session; user: CurrentUser }> {
  const email = input.email.trim().toLowerCase();
  try {
    await assertSignInAllowed(email, meta.ip);
  } catch (err) {
    if (err instanceof TooManyRequestsError) {
      await recordAudit({ actorId: null, action: "sign-in.throttled", entityType: "user", detail: { email }, ip: meta.ip });
    }
    throw err;
  }
  const found = await getCredentialsByEmail(email);
  let ok = false;
  if (found) ok = (await verifyPassword(found.passwordHash, input.password)) && found.user.status === "active";
  else await verifyAgainstDummy(input.password);

  await recordSignInAttempt({ email, ip: meta.ip, succeeded: ok });
  if (!ok || !found) {
    await recordAudit({
      actorId: found?.user.id ?? null,
      action: "sign-in.failed",
      entityType: "user",
      entityId: found?.user.id,
      detail: { email, ...(found && found.user.status !== "active" ? { reason: "disabled" } : {}) },
      ip: meta.ip,
    });
    throw new UnauthorizedError(SIGN_IN_FAILED_MESSAGE);
  }
  if (input.previousSessionId) await lucia().invalidateSession(input.previousSessionId);
  const session = await lucia().createSession(found.user.id, { ip: meta.ip, user_agent: meta.userAgent?.slice(0, 300) ?? null });
  await recordAudit({ actorId: found.user.id, action: "sign-in", entityType: "user", entityId: found.user.id, ip: meta.ip });
  const { id, name, role } = found.user;
  return { session, user: { id, email: found.user.email, name, role } };
}

/** Ends one session server-side and logs it. */
export async function signOut(sessionId: string, userId: string, meta: RequestMeta): Promise<void> {
  await lucia().invalidateSession(sessionId);
  await recordAudit({ actorId: userId, action: "sign-out", entityType: "user", entityId: userId, ip: meta.ip });
}

/**
 * Ends every session of the user, on every device, and logs it. With `revokeTokens` it also revokes every API
 * token: "everywhere" then includes bench scripts, so a token made by someone who got in does not outlive the
 * owner's clean-up (OWASP Session Management Cheat Sheet: logout ends the credentials the user asks to end).
 * Without it the tokens stay, for an owner who only wants the browsers signed out and the bench running.
 * The audit event records the choice and the count either way. A password reset revokes every token regardless.
 */
export async function signOutEverywhere(userId: string, options: { revokeTokens: boolean }, meta: RequestMeta): Promise<{ tokensRevoked: number }> {
  await lucia().invalidateUserSessions(userId);
  const tokensRevoked = options.revokeTokens ? await revokeAllApiTokenRows(userId) : 0;
  await recordAudit({
    actorId: userId,
    action: "sign-out.everywhere",
    entityType: "user",
    entityId: userId,
    ip: meta.ip,
    detail: { revokeTokens: options.revokeTokens, tokensRevoked },
  });
  return { tokensRevoked };
}
