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

/** The e-mail of an invitation, to send once the answer is out (see inviteUser). Never throws. */
export type InvitationDelivery = () => Promise<void>;

function deliveryOf(mail: Parameters<typeof sendInvitationEmail>[0], audit: { actorId: string; invitationId: string; ip: string | null }): InvitationDelivery {
  return async () => {
    try {
      await sendInvitationEmail(mail);
    } catch (err) {
      // Nobody is waiting for this answer any more: the failure goes to the log and the audit log, and the open
      // invitation on the People page can be resent.
      const error = err instanceof Error ? err.message : String(err);
      console.error(`invitation e-mail to ${mail.to} not sent: ${error}`);
      await recordAudit({ actorId: audit.actorId, action: "invitation.mail-failed", entityType: "invitation", entityId: audit.invitationId, detail: { email: mail.to, error: error.slice(0, 300) }, ip: audit.ip }).catch(() => {});
    }
  };
}

/**
 * Invites an address with a role. The caller must have checked people:manage, and runs the returned delivery
 * after its answer is sent (Next's after()), as forgot-password does: sending takes an SMTP round trip
 * (≈ 100 ms or more) that the refusal of an address with an account does not, so waiting for it would let the
 * answer's time alone say whether an address has an account, to anyone who can time the form without reading
 * its answer. The answer's words still say so: only admins invite, and they see every account anyway.
 * @throws ConflictError when the address already has an account or an open invitation
 */
export async function inviteUser(input: { email: string; role: Role; inviter: CurrentUser }, meta: RequestMeta): Promise<{ invitation: Invitation; deliver: InvitationDelivery }> {
  const email = input.email.trim().toLowerCase();
  // Both lookups every time, so a refusal does the same reading as an invitation before it answers.
  const [account, openInvitation] = await Promise.all([getUserByEmail(email), getOpenInvitationByEmail(email)]);
  if (account) throw new ConflictError(`${email} already has an account.`);
  if (openInvitation) throw new ConflictError(`${email} is already invited; resend that invitation instead.`);
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
  const deliver = deliveryOf(
    { to: email, role: input.role, inviterName: input.inviter.name, token, expiresAt: invitation.expiresAt },
    { actorId: input.inviter.id, invitationId: invitation.id, ip: meta.ip },
  );
  return { invitation, deliver };
}

/**
 * Renews an open invitation with a new link and a fresh expiry (the old link stops working) and returns the
 * delivery of the new e-mail, to run after the answer like inviteUser's.
 * @throws NotFoundError when the invitation is not open
 */
export async function resendInvitation(input: { invitationId: string; actor: CurrentUser }, meta: RequestMeta): Promise<{ deliver: InvitationDelivery }> {
  const invitation = await getOpenInvitationById(input.invitationId);
  if (!invitation) throw new NotFoundError("That invitation");
  const token = newSecretToken();
  const expiresAt = expiry();
  await renewInvitation(invitation.id, hashSecretToken(token), expiresAt);
  await recordAudit({ actorId: input.actor.id, action: "invitation.resent", entityType: "invitation", entityId: invitation.id, detail: { email: invitation.email }, ip: meta.ip });
  return {
    deliver: deliveryOf({ to: invitation.email, role: invitation.role, inviterName: input.actor.name, token, expiresAt }, { actorId: input.actor.id, invitationId: invitation.id, ip: meta.ip }),
  };
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
