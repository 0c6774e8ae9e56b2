"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { describedBy, Field, FormMessage, Input, Select } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { roles } from "@/lib/auth/permissions";
import { inviteAction } from "./actions";

export function InviteForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(inviteAction, {});
  return (
    <form action={action} className="space-y-3" noValidate>
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <div className="grid gap-3 sm:grid-cols-[1fr_12rem_auto] sm:items-end">
        <Field id="invite-email" label="E-mail" errors={state.errors?.email}>
          <Input id="invite-email" name="email" type="email" defaultValue={state.ok ? "" : state.values?.email} required aria-describedby={describedBy("invite-email")} aria-invalid={Boolean(state.errors?.email)} />
        </Field>
        <Field id="invite-role" label="Role" errors={state.errors?.role}>
          <Select id="invite-role" name="role" defaultValue={state.values?.role ?? "technician"} aria-describedby={describedBy("invite-role")} aria-invalid={Boolean(state.errors?.role)}>
            {roles.map((r) => (
              <option key={r} value={r}>
                {r}
              </option>
            ))}
          </Select>
        </Field>
        <div className="sm:pb-[1.6rem]">
          <Button type="submit" disabled={pending}>
            {pending ? "Sending…" : "Send invitation"}
          </Button>
        </div>
      </div>
    </form>
  );
}
