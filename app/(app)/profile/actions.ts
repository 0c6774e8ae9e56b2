"use server";

import { revalidatePath } from "next/cache";
import { createApiToken, revokeApiToken } from "@/lib/auth/api-tokens";
import { formFields, invalidState, keepValues, stateFromError, type FormState } from "@/lib/auth/action-state";
import { getCurrentSession } from "@/lib/auth/current-user";
import { changePassword, renameUser, updateNotificationPreferences } from "@/lib/auth/profile";
import { requestMeta } from "@/lib/auth/request-meta";
import { requirePermission } from "@/lib/auth/require-permission";
import { changePasswordSchema } from "@/lib/validations/auth";
import { notificationPreferencesSchema, profileNameSchema } from "@/lib/validations/people";
import { createTokenSchema, revokeTokenSchema } from "@/lib/validations/tokens";

// Everyone who can sign in manages their own profile, so these ask for the lowest permission ("read"):
// the check still refuses anonymous and disabled callers in the one place.

async function signedIn() {
  const { session, user } = await getCurrentSession();
  return { session, user: requirePermission(user, "read") };
}

export async function renameAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const { user } = await signedIn();
    const fields = formFields(formData);
    const parsed = profileNameSchema.safeParse(fields);
    if (!parsed.success) return keepValues(invalidState(parsed.error), { name: fields.name });
    await renameUser({ userId: user.id, name: parsed.data.name }, await requestMeta());
    revalidatePath("/", "layout");
    return { ok: true, message: "Name saved.", values: { name: parsed.data.name } };
  } catch (err) {
    return stateFromError(err);
  }
}

export async function changePasswordAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const { user, session } = await signedIn();
    const parsed = changePasswordSchema.safeParse(formFields(formData));
    if (!parsed.success) return invalidState(parsed.error);
    await changePassword({ userId: user.id, currentPassword: parsed.data.currentPassword, password: parsed.data.password, keepSessionId: session?.id ?? null }, await requestMeta());
    return { ok: true, message: "Password changed. Your other devices were signed out." };
  } catch (err) {
    return stateFromError(err);
  }
}

export async function notificationsAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const { user } = await signedIn();
    const parsed = notificationPreferencesSchema.safeParse(formFields(formData));
    if (!parsed.success) return invalidState(parsed.error);
    await updateNotificationPreferences({ userId: user.id, flagEmails: parsed.data.flagEmails }, await requestMeta());
    return { ok: true, message: "Notification choice saved." };
  } catch (err) {
    return stateFromError(err);
  }
}

export async function createTokenAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const { user } = await signedIn();
    const fields = formFields(formData);
    const parsed = createTokenSchema.safeParse(fields);
    if (!parsed.success) return keepValues(invalidState(parsed.error), { name: fields.name });
    const { ip } = await requestMeta();
    const { token } = await createApiToken({ userId: user.id, name: parsed.data.name, ip });
    revalidatePath("/profile");
    return { ok: true, message: `Token "${parsed.data.name}" created. Copy it now: it is shown only this once.`, secret: token };
  } catch (err) {
    return stateFromError(err);
  }
}

export async function revokeTokenAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const { user } = await signedIn();
    const parsed = revokeTokenSchema.safeParse(formFields(formData));
    if (!parsed.success) return invalidState(parsed.error);
    const { ip } = await requestMeta();
    await revokeApiToken({ userId: user.id, tokenId: parsed.data.tokenId, ip });
    revalidatePath("/profile");
    return { ok: true, message: "Revoked." };
  } catch (err) {
    return stateFromError(err);
  }
}
