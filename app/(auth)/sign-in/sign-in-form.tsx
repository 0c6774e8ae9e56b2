"use client";

import Link from "next/link";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { describedBy, Field, FormMessage, Input } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { signInAction } from "../actions";

export interface SignInFormProps {
  next?: string;
}

export function SignInForm({ next }: SignInFormProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(signInAction, {});
  return (
    <form action={action} className="space-y-4" noValidate>
      <FormMessage message={state.message} />
      {next ? <input type="hidden" name="next" value={next} /> : null}
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
      <Field id="password" label="Password" errors={state.errors?.password}>
        <Input
          id="password"
          name="password"
          type="password"
          autoComplete="current-password"
          required
          aria-describedby={describedBy("password")}
          aria-invalid={Boolean(state.errors?.password)}
        />
      </Field>
      <div className="flex flex-wrap items-center justify-between gap-3 pt-1">
        <Button type="submit" disabled={pending}>
          {pending ? "Signing in…" : "Sign in"}
        </Button>
        <Link href="/forgot-password" className="text-sm font-medium text-copper underline underline-offset-2">
          Forgot your password?
        </Link>
      </div>
    </form>
  );
}
