import { generateIdFromEntropySize, type Session } from "lucia";
import { revokeAllApiTokenRows } from "@/db/queries/api-tokens";
import { recordAudit } from "@/db/queries/audit";
import { closePasswordResets, countRecentPasswordResets, createPasswordReset, getOpenPasswordReset } from "@/db/queries/password-resets";
import { getUserByEmail, updatePasswordHash } from "@/db/queries/users";
import { db } from "@/db/index";
import { BadRequestError } from "@/lib/errors";
import type { CurrentUser } from "./current-user-type";
import { sendPasswordResetEmail } from "./emails";
import { lucia } from "./lucia";
import { hashPassword } from "./password";
import { hashSecretToken, newSecretToken } from "./secret-token";
import type { RequestMeta } from "./sign-in";

/** How long a reset link works, in seconds. */
export const RESET_LINK_LIFETIME_SECONDS = 60 * 60;
/** At most this many reset e-mails per account per hour; further requests are answered alike but send nothing. */
export const RESET_EMAILS_PER_HOUR = 3;

export const RESET_LINK_INVALID_MESSAGE = "This reset link has expired or was already used. Ask for a new one.";

/**
 * Sends a reset link when the address belongs to an active account. The caller answers the same way either
 * way, so the form does not reveal which addresses have accounts.
 * @returns whether an e-mail was sent (for tests and the audit log only; never shown)
 * @throws MailError when the mail server refuses or is unreachable
 */
export async function requestPasswordReset(email: string, meta: RequestMeta): Promise<boolean> {
  const user = await getUserByEmail(email.trim().toLowerCase());
  if (!user || user.status !== "active") return false;
  if ((await countRecentPasswordResets(user.id, 3600)) >= RESET_EMAILS_PER_HOUR) return false;
  const token = newSecretToken();
  const expiresAt = new Date(Date.now() + RESET_LINK_LIFETIME_SECONDS * 1000);
  const id = generateIdFromEntropySize(10);
  await createPasswordReset({ id, userId: user.id, tokenHash: hashSecretToken(token), expiresAt, ip: meta.ip });
  await recordAudit({ actorId: user.id, action: "password-reset.requested", entityType: "user", entityId: user.id, ip: meta.ip });
  await sendPasswordResetEmail({ to: user.email, name: user.name, token, expiresAt });
  return true;
}

/** The account a reset link belongs to while the link is usable, else null (for the reset page). */
export async function getPasswordResetAccount(token: string): Promise<{ email: string; name: string } | null> {
  const open = await getOpenPasswordReset(hashSecretToken(token));
  return open ? { email: open.email, name: open.name } : null;
}

/**
 * Sets a new password through a reset link: the link and every older one stop working, all of the user's
 * sessions end, and a fresh session is opened for the browser that used the link.
 * @returns the new session and its user
 * @throws BadRequestError (RESET_LINK_INVALID_MESSAGE) when the link is unknown, used or expired
 */
export async function resetPassword(input: { token: string; password: string }, meta: RequestMeta): Promise<{ session: Session; user: CurrentUser }> {
  const passwordHash = await hashPassword(input.password);
  const userId = await db().transaction(async (trx) => {
    const open = await getOpenPasswordReset(hashSecretToken(input.token), trx, true);
    if (!open) return null;
    await closePasswordResets(open.userId, trx);
    await updatePasswordHash(open.userId, passwordHash, trx);
    await trx("user_session").where({ user_id: open.userId }).delete();
    // A reset is how an owner takes the account back: tokens made by whoever was in go with the sessions.
    const tokensRevoked = await revokeAllApiTokenRows(open.userId, trx);
    await recordAudit({ actorId: open.userId, action: "password-reset.completed", entityType: "user", entityId: open.userId, ip: meta.ip, detail: { tokensRevoked } }, trx);
    return open.userId;
  });
  if (!userId) throw new BadRequestError(RESET_LINK_INVALID_MESSAGE);
  const session = await lucia().createSession(userId, { ip: meta.ip, user_agent: meta.userAgent?.slice(0, 300) ?? null });
  const { user } = await lucia().validateSession(session.id);
  if (!user) throw new BadRequestError(RESET_LINK_INVALID_MESSAGE);
  return { session, user: { id: user.id, email: user.email, name: user.name, role: user.role } };
}
