import { recordAudit } from "@/db/queries/audit";
import { setNotificationPreferences, type FlagEmails } from "@/db/queries/notification-preferences";
import { deleteOtherSessions } from "@/db/queries/sessions";
import { getPasswordHashById, updatePasswordHash, updateUserName } from "@/db/queries/users";
import { BadRequestError } from "@/lib/errors";
import { hashPassword, verifyPassword } from "./password";
import type { RequestMeta } from "./sign-in";

/** Renames the user. */
export async function renameUser(input: { userId: string; name: string }, meta: RequestMeta): Promise<void> {
  await updateUserName(input.userId, input.name);
  await recordAudit({ actorId: input.userId, action: "user.renamed", entityType: "user", entityId: input.userId, detail: { name: input.name }, ip: meta.ip });
}

/**
 * Changes the password after checking the current one, and ends the user's other sessions.
 * @param keepSessionId the session making the change, which stays signed in
 * @throws BadRequestError with a currentPassword field error when the current password is wrong
 */
export async function changePassword(
  input: { userId: string; currentPassword: string; password: string; keepSessionId: string | null },
  meta: RequestMeta,
): Promise<void> {
  if (!(await verifyPassword(await getPasswordHashById(input.userId), input.currentPassword))) {
    throw new BadRequestError("Your current password is not right.", { currentPassword: ["Your current password is not right."] });
  }
  await updatePasswordHash(input.userId, await hashPassword(input.password));
  const ended = await deleteOtherSessions(input.userId, input.keepSessionId);
  await recordAudit({ actorId: input.userId, action: "user.password-changed", entityType: "user", entityId: input.userId, detail: { otherSessionsEnded: ended }, ip: meta.ip });
}

/** Stores which builds' flags the user is e-mailed about. */
export async function updateNotificationPreferences(input: { userId: string; flagEmails: FlagEmails }, meta: RequestMeta): Promise<void> {
  await setNotificationPreferences(input.userId, { flagEmails: input.flagEmails });
  await recordAudit({ actorId: input.userId, action: "user.notifications-changed", entityType: "user", entityId: input.userId, detail: { flagEmails: input.flagEmails }, ip: meta.ip });
}
