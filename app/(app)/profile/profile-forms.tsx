"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { describedBy, Field, FormMessage, Input } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { PASSWORD_MIN_LENGTH } from "@/lib/validations/auth";
import { changePasswordAction, createTokenAction, notificationsAction, renameAction } from "./actions";

export interface NameFormProps {
  name: string;
}

export function NameForm({ name }: NameFormProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(renameAction, {});
  return (
    <form action={action} className="space-y-3" noValidate>
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <Field id="profile-name" label="Name" errors={state.errors?.name}>
        <Input id="profile-name" name="name" defaultValue={state.values?.name ?? name} autoComplete="name" required aria-describedby={describedBy("profile-name")} aria-invalid={Boolean(state.errors?.name)} />
      </Field>
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? "Saving…" : "Save name"}
      </Button>
    </form>
  );
}

export function PasswordForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(changePasswordAction, {});
  return (
    <form action={action} className="space-y-3" noValidate>
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <Field id="current-password" label="Current password" errors={state.errors?.currentPassword}>
        <Input id="current-password" name="currentPassword" type="password" autoComplete="current-password" required aria-describedby={describedBy("current-password")} aria-invalid={Boolean(state.errors?.currentPassword)} />
      </Field>
      <Field id="new-password" label="New password" hint={`At least ${PASSWORD_MIN_LENGTH} characters.`} errors={state.errors?.password}>
        <Input id="new-password" name="password" type="password" autoComplete="new-password" required aria-describedby={describedBy("new-password")} aria-invalid={Boolean(state.errors?.password)} />
      </Field>
      <Field id="confirm-password" label="Repeat the new password" errors={state.errors?.confirm}>
        <Input id="confirm-password" name="confirm" type="password" autoComplete="new-password" required aria-describedby={describedBy("confirm-password")} aria-invalid={Boolean(state.errors?.confirm)} />
      </Field>
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? "Saving…" : "Change password"}
      </Button>
    </form>
  );
}

const flagChoices = [
  { value: "my-builds", label: "Builds I created or follow", hint: "The usual choice." },
  { value: "all", label: "Every build on this Tankbook", hint: "For leads who review everything." },
  { value: "none", label: "None", hint: "You still see flags in the app." },
] as const;

export interface NotificationsFormProps {
  flagEmails: string;
}

export function NotificationsForm({ flagEmails }: NotificationsFormProps) {
  const [state, action, pending] = useActionState<FormState, FormData>(notificationsAction, {});
  return (
    <form action={action} className="space-y-3">
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <fieldset aria-describedby="flag-emails-error">
        <legend className="text-sm font-medium">E-mail me when a run raises a spec flag on…</legend>
        <div className="mt-2 space-y-2">
          {flagChoices.map((c) => (
            <label key={c.value} className="flex items-start gap-2 text-sm">
              <input type="radio" name="flagEmails" value={c.value} defaultChecked={flagEmails === c.value} className="mt-1 accent-copper" />
              <span>
                {c.label} <span className="text-xs text-ink-faint">{c.hint}</span>
              </span>
            </label>
          ))}
        </div>
        <div id="flag-emails-error" aria-live="polite" className="text-xs font-medium text-verdict-fail">
          {state.errors?.flagEmails?.join(" ")}
        </div>
      </fieldset>
      <Button type="submit" variant="secondary" disabled={pending}>
        {pending ? "Saving…" : "Save choice"}
      </Button>
    </form>
  );
}

export function CreateTokenForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(createTokenAction, {});
  return (
    <form action={action} className="space-y-3" noValidate>
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      {state.secret ? (
        <div className="rounded-md border border-rule-strong bg-paper-sunk px-3 py-2">
          <label htmlFor="new-token" className="text-xs font-medium text-ink-soft">
            Your new token
          </label>
          <input id="new-token" readOnly value={state.secret} onFocus={(e) => e.currentTarget.select()} className="num mt-1 block w-full bg-transparent font-mono text-sm" />
        </div>
      ) : null}
      <div className="grid gap-3 sm:grid-cols-[1fr_auto] sm:items-end">
        <Field id="token-name" label="Token name" hint="After the script or bench that will use it, e.g. “bench 3 capture script”." errors={state.errors?.name}>
          <Input id="token-name" name="name" defaultValue={state.ok ? "" : state.values?.name} required maxLength={60} aria-describedby={describedBy("token-name")} aria-invalid={Boolean(state.errors?.name)} />
        </Field>
        <div className="sm:pb-[2.6rem]">
          <Button type="submit" disabled={pending}>
            {pending ? "Creating…" : "Create token"}
          </Button>
        </div>
      </div>
    </form>
  );
}
