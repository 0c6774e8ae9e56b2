import { db } from "../index";

/** Which builds' spec flags a person is e-mailed about: none, the builds they created or follow, or all. */
export type FlagEmails = "none" | "my-builds" | "all";

export async function getNotificationPreferences(userId: string): Promise<{ flagEmails: FlagEmails }> {
  const row = await db()("notification_preferences").where({ user_id: userId }).first();
  return { flagEmails: (row?.flag_emails as FlagEmails | undefined) ?? "my-builds" };
}

export async function setNotificationPreferences(userId: string, prefs: { flagEmails: FlagEmails }): Promise<void> {
  await db()("notification_preferences")
    .insert({ user_id: userId, flag_emails: prefs.flagEmails, updated_at: db().fn.now() })
    .onConflict("user_id")
    .merge();
}
