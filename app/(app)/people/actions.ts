"use server";

import { revalidatePath } from "next/cache";
import { after } from "next/server";
import { getCurrentUser } from "@/lib/auth/current-user";
import { inviteUser, resendInvitation, revokeInvitation } from "@/lib/auth/invitations";
import { changeRole, setUserStatus } from "@/lib/auth/people";
import { requestMeta } from "@/lib/auth/request-meta";
import { requirePermission } from "@/lib/auth/require-permission";
import { formFields, invalidState, keepValues, stateFromError, type FormState } from "@/lib/auth/action-state";
import { changeRoleSchema, invitationIdSchema, inviteSchema, setStatusSchema } from "@/lib/validations/people";

export async function inviteAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const fields = formFields(formData);
  try {
    const actor = requirePermission(await getCurrentUser(), "people:manage");
    const parsed = inviteSchema.safeParse(fields);
    if (!parsed.success) return keepValues(invalidState(parsed.error), { email: fields.email, role: fields.role });
    const { deliver } = await inviteUser({ ...parsed.data, inviter: actor }, await requestMeta());
    // The e-mail goes out after the answer, so an invitation is answered as fast as an address with an account.
    after(deliver);
    revalidatePath("/people");
    return { ok: true, message: `Invitation sent to ${parsed.data.email} as ${parsed.data.role}. The link works for 7 days.` };
  } catch (err) {
    return keepValues(stateFromError(err), { email: fields.email, role: fields.role });
  }
}

export async function resendInvitationAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const actor = requirePermission(await getCurrentUser(), "people:manage");
    const parsed = invitationIdSchema.safeParse(formFields(formData));
    if (!parsed.success) return invalidState(parsed.error);
    const { deliver } = await resendInvitation({ ...parsed.data, actor }, await requestMeta());
    after(deliver);
    revalidatePath("/people");
    return { ok: true, message: "Sent again with a new link." };
  } catch (err) {
    return stateFromError(err);
  }
}

export async function revokeInvitationAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const actor = requirePermission(await getCurrentUser(), "people:manage");
    const parsed = invitationIdSchema.safeParse(formFields(formData));
    if (!parsed.success) return invalidState(parsed.error);
    await revokeInvitation({ ...parsed.data, actor }, await requestMeta());
    revalidatePath("/people");
    return { ok: true, message: "Revoked." };
  } catch (err) {
    return stateFromError(err);
  }
}

export async function changeRoleAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const actor = requirePermission(await getCurrentUser(), "people:manage");
    const parsed = changeRoleSchema.safeParse(formFields(formData));
    if (!parsed.success) return invalidState(parsed.error);
    await changeRole({ ...parsed.data, actor }, await requestMeta());
    revalidatePath("/people");
    return { ok: true, message: "Role saved." };
  } catch (err) {
    return stateFromError(err);
  }
}

export async function setStatusAction(_prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const actor = requirePermission(await getCurrentUser(), "people:manage");
    const parsed = setStatusSchema.safeParse(formFields(formData));
    if (!parsed.success) return invalidState(parsed.error);
    await setUserStatus({ ...parsed.data, actor }, await requestMeta());
    revalidatePath("/people");
    return { ok: true, message: parsed.data.status === "disabled" ? "Disabled and signed out." : "Enabled." };
  } catch (err) {
    return stateFromError(err);
  }
}
