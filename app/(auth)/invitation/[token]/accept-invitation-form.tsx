"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { describedBy, Field, FormMessage, Input } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { acceptInvitationAction } from "../../actions";
import { NewPasswordFields } from "../../new-password-fields";

export interface AcceptInvitationFormProps {
  token: string;
  email: string;
}

export function AcceptInvitationForm({ token, email }: AcceptInvitationFormProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(acceptInvitationAction, {});
  return (
    <form action={action} className="space-y-4" noValidate>
      <FormMessage message={state.message} />
      <input type="hidden" name="token" value={token} />
      <input type="email" name="username" autoComplete="username" value={email} readOnly hidden />
      <Field id="name" label="Your name" hint="As your team will see it on builds, runs and reviews." errors={state.errors?.name}>
        <Input id="name" name="name" autoComplete="name" defaultValue={state.values?.name} required autoFocus aria-describedby={describedBy("name")} aria-invalid={Boolean(state.errors?.name)} />
      </Field>
      <NewPasswordFields errors={state.errors} />
      <Button type="submit" disabled={pending}>
        {pending ? "Creating your account…" : "Create my account"}
      </Button>
    </form>
  );
}
