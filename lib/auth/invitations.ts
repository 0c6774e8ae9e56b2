import { generateIdFromEntropySize, type Session } from "lucia";
import { recordAudit } from "@/db/queries/audit";
import {
  createInvitationRow,
  getOpenInvitationByEmail,
  getOpenInvitationById,
  getUsableInvitationByTokenHash,
  markInvitationAccepted,
  markInvitationRevoked,
  renewInvitation,
  type Invitation,
} from "@/db/queries/invitations";
import { createUser, getUserByEmail } from "@/db/queries/users";
import { db } from "@/db/index";
import { BadRequestError, ConflictError, NotFoundError } from "@/lib/errors";
import type { CurrentUser } from "./current-user-type";
import { sendInvitationEmail } from "./emails";
import { lucia } from "./lucia";
import { hashPassword } from "./password";
import type { Role } from "./permissions";
import { hashSecretToken, newSecretToken } from "./secret-token";
import type { RequestMeta } from "./sign-in";

/** How long an invitation link works, in seconds. */
export const INVITATION_LIFETIME_SECONDS = 7 * 24 * 3600;

export const INVITATION_INVALID_MESSAGE = "This invitation has expired, was revoked or was already used. Ask your admin for a new one.";

function expiry(): Date {
  return new Date(Date.now() + INVITATION_LIFETIME_SECONDS * 1000);
}

/**
 * Invites an address with a role and e-mails the single-use link. The caller must have checked people:manage.
 * @throws ConflictError when the address already has an account or an open invitation; MailError when sending fails
 */
export async function inviteUser(input: { email: string; role: Role; inviter: CurrentUser }, meta: RequestMeta): Promise<Invitation> {
  const email = input.email.trim().toLowerCase();
  if (await getUserByEmail(email)) throw new ConflictError(`${email} already has an account.`);
  if (await getOpenInvitationByEmail(email)) throw new ConflictError(`${email} is already invited; resend that invitation instead.`);
  const token = newSecretToken();
  let invitation: Invitation;
  try {
    invitation = await db().transaction(async (trx) => {
      const row = await createInvitationRow(
        { id: generateIdFromEntropySize(10), email, role: input.role, tokenHash: hashSecretToken(token), invitedBy: input.inviter.id, expiresAt: expiry() },
        trx,
      );
      await recordAudit({ actorId: input.inviter.id, action: "invitation.created", entityType: "invitation", entityId: row.id, detail: { email, role: input.role }, ip: meta.ip }, trx);
      return row;
    });
  } catch (err) {
    // Two admins inviting the same address at once: the partial unique index lets only one through.
    if ((err as { code?: string }).code === "23505") throw new ConflictError(`${email} is already invited; resend that invitation instead.`);
    throw err;
  }
  await sendInvitationEmail({ to: email, role: input.role, inviterName: input.inviter.name, token, expiresAt: invitation.expiresAt });
  return invitation;
}

/**
 * Sends an open invitation again with a new link and a fresh expiry; the old link stops working.
 * @throws NotFoundError when the invitation is not open
 */
export async function resendInvitation(input: { invitationId: string; actor: CurrentUser }, meta: RequestMeta): Promise<void> {
  const invitation = await getOpenInvitationById(input.invitationId);
  if (!invitation) throw new NotFoundError("That invitation");
  const token = newSecretToken();
  const expiresAt = expiry();
  await renewInvitation(invitation.id, hashSecretToken(token), expiresAt);
  await recordAudit({ actorId: input.actor.id, action: "invitation.resent", entityType: "invitation", entityId: invitation.id, detail: { email: invitation.email }, ip: meta.ip });
  await sendInvitationEmail({ to: invitation.email, role: invitation.role, inviterName: input.actor.name, token, expiresAt });
}

/** Revokes an open invitation. @throws NotFoundError when it is not open */
export async function revokeInvitation(input: { invitationId: string; actor: CurrentUser }, meta: RequestMeta): Promise<void> {
  const invitation = await getOpenInvitationById(input.invitationId);
  if (!invitation || !(await markInvitationRevoked(invitation.id))) throw new NotFoundError("That invitation");
  await recordAudit({ actorId: input.actor.id, action: "invitation.revoked", entityType: "invitation", entityId: invitation.id, detail: { email: invitation.email }, ip: meta.ip });
}

/** The invitation behind a link while it is usable, else null (for the invitation page). */
export async function getInvitationForToken(token: string): Promise<Invitation | null> {
  return getUsableInvitationByTokenHash(hashSecretToken(token));
}

/**
 * Accepts an invitation: creates the account with the invited role, closes the invitation and opens a session.
 * @throws BadRequestError (INVITATION_INVALID_MESSAGE) when the link is unknown, expired, revoked or used;
 *         ConflictError when an account with that address appeared meanwhile
 */
export async function acceptInvitation(input: { token: string; name: string; password: string }, meta: RequestMeta): Promise<{ session: Session; user: CurrentUser }> {
  const passwordHash = await hashPassword(input.password);
  const user = await db().transaction(async (trx) => {
    const invitation = await getUsableInvitationByTokenHash(hashSecretToken(input.token), trx, true);
    if (!invitation) return null;
    if (await getUserByEmail(invitation.email, trx)) throw new ConflictError(`${invitation.email} already has an account; sign in instead.`);
    const created = await createUser({ id: generateIdFromEntropySize(10), email: invitation.email, name: input.name, role: invitation.role, passwordHash }, trx);
    await markInvitationAccepted(invitation.id, trx);
    await recordAudit({ actorId: created.id, action: "invitation.accepted", entityType: "invitation", entityId: invitation.id, detail: { email: created.email, role: created.role }, ip: meta.ip }, trx);
    return created;
  });
  if (!user) throw new BadRequestError(INVITATION_INVALID_MESSAGE);
  const session = await lucia().createSession(user.id, { ip: meta.ip, user_agent: meta.userAgent?.slice(0, 300) ?? null });
  return { session, user: { id: user.id, email: user.email, name: user.name, role: user.role } };
}
