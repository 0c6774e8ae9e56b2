"use server";

import { cookies } from "next/headers";
import { redirect } from "next/navigation";
import { after } from "next/server";
import { getCurrentSession, setSessionCookie, clearSessionCookie } from "@/lib/auth/current-user";
import { acceptInvitation } from "@/lib/auth/invitations";
import { SESSION_COOKIE_NAME } from "@/lib/auth/lucia";
import { requestPasswordReset, resetPassword } from "@/lib/auth/password-reset";
import { requestMeta } from "@/lib/auth/request-meta";
import { signIn, signOut, signOutEverywhere } from "@/lib/auth/sign-in";
import { formFields, invalidState, keepValues, stateFromError, type FormState } from "@/lib/auth/action-state";
import { acceptInvitationSchema, forgotPasswordSchema, resetPasswordSchema, signInSchema, signOutEverywhereSchema } from "@/lib/validations/auth";

export async function signInAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const fields = formFields(formData);
  const parsed = signInSchema.safeParse(fields);
  if (!parsed.success) return keepValues(invalidState(parsed.error), { email: fields.email });
  try {
    const previousSessionId = (await cookies()).get(SESSION_COOKIE_NAME)?.value ?? null;
    const { session } = await signIn({ ...parsed.data, previousSessionId }, await requestMeta());
    await setSessionCookie(session.id);
  } catch (err) {
    return keepValues(stateFromError(err), { email: fields.email });
  }
  redirect(parsed.data.next);
}

export async function forgotPasswordAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const fields = formFields(formData);
  const parsed = forgotPasswordSchema.safeParse(fields);
  if (!parsed.success) return keepValues(invalidState(parsed.error), { email: fields.email });
  // The lookup, the link and the e-mail run after the answer is sent (Next's after()), so a known address is
  // answered as fast as an unknown one and the timing does not tell which addresses have accounts (OWASP
  // Forgot Password Cheat Sheet: "consistent response time"). A mail failure is logged, not shown: showing it
  // would tell the same thing.
  const meta = await requestMeta();
  after(() =>
    requestPasswordReset(parsed.data.email, meta).catch((err: unknown) => {
      console.error(`password reset e-mail not sent: ${err instanceof Error ? err.message : String(err)}`);
    }),
  );
  return {
    ok: true,
    message: `If ${parsed.data.email} belongs to an active account, a reset link is on its way. It works once, for one hour.`,
  };
}

export async function resetPasswordAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const parsed = resetPasswordSchema.safeParse(formFields(formData));
  if (!parsed.success) return invalidState(parsed.error);
  try {
    const { session } = await resetPassword(parsed.data, await requestMeta());
    await setSessionCookie(session.id);
  } catch (err) {
    return stateFromError(err);
  }
  redirect("/dashboard?welcome=password-reset");
}

export async function acceptInvitationAction(_prev: FormState, formData: FormData): Promise<FormState> {
  const fields = formFields(formData);
  const parsed = acceptInvitationSchema.safeParse(fields);
  if (!parsed.success) return keepValues(invalidState(parsed.error), { name: fields.name });
  try {
    const { session } = await acceptInvitation(parsed.data, await requestMeta());
    await setSessionCookie(session.id);
  } catch (err) {
    return keepValues(stateFromError(err), { name: fields.name });
  }
  redirect("/dashboard?welcome=invited");
}

/** Ends this session server-side. */
export async function signOutAction(): Promise<void> {
  const { session, user } = await getCurrentSession();
  if (session) await signOut(session.id, user.id, await requestMeta());
  await clearSessionCookie();
  redirect("/sign-in?signed-out=1");
}

/** Ends every session of the signed-in user, on every device, and revokes their API tokens when the box is ticked. */
export async function signOutEverywhereAction(formData: FormData): Promise<void> {
  const { user } = await getCurrentSession();
  // Anything but the checkbox's "on" reads as unticked: the sessions still end, which is what the button promises.
  const parsed = signOutEverywhereSchema.safeParse(formFields(formData));
  const revokeTokens = parsed.success && parsed.data.revokeTokens;
  if (user) await signOutEverywhere(user.id, { revokeTokens }, await requestMeta());
  await clearSessionCookie();
  redirect(`/sign-in?signed-out=${user && revokeTokens ? "everywhere-tokens" : "everywhere"}`);
}
