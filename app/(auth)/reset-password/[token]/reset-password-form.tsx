"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { resetPasswordAction } from "../../actions";
import { NewPasswordFields } from "../../new-password-fields";

export interface ResetPasswordFormProps {
  token: string;
  email: string;
}

export function ResetPasswordForm({ token, email }: ResetPasswordFormProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(resetPasswordAction, {});
  return (
    <form action={action} className="space-y-4" noValidate>
      <FormMessage message={state.message} />
      <input type="hidden" name="token" value={token} />
      {/* Lets password managers file the new password under the right account. */}
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <NewPasswordFields errors={state.errors} />
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : "Save the new password and sign in"}
      </Button>
    </form>
  );
}
