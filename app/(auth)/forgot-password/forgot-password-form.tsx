"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { describedBy, Field, FormMessage, Input } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { forgotPasswordAction } from "../actions";

export function ForgotPasswordForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(forgotPasswordAction, {});
  return (
    <form action={action} className="space-y-4" noValidate>
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <Field id="email" label="E-mail" errors={state.errors?.email}>
        <Input
          id="email"
          name="email"
          type="email"
          autoComplete="username"
          defaultValue={state.values?.email}
          required
          autoFocus
          aria-describedby={describedBy("email")}
          aria-invalid={Boolean(state.errors?.email)}
        />
      </Field>
      <Button type="submit" disabled={pending}>
        {pending ? "Sending…" : "Send the reset link"}
      </Button>
    </form>
  );
}
