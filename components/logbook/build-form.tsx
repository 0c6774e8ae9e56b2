"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Select, describedBy } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { BUILD_KIND_NAMES } from "./build-status";

export interface BuildFormProps {
  action: (state: FormState, formData: FormData) => Promise<FormState>;
  /** A label to suggest, e.g. the next free "BB-3". */
  suggestedLabel?: string;
}

/** A new build of a design: its label and what kind of board it is. */
export function BuildForm({ action, suggestedLabel }: BuildFormProps) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  return (
    <form action={formAction} noValidate className="space-y-3">
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <div className="grid gap-3 sm:grid-cols-3">
        <Field id="build-label" label="Label" hint="As written on the board, e.g. BB-1." errors={state.errors?.label}>
          <Input
            id="build-label"
            name="label"
            defaultValue={state.values?.label ?? suggestedLabel}
            maxLength={80}
            aria-describedby={describedBy("build-label")}
            aria-invalid={state.errors?.label ? true : undefined}
          />
        </Field>
        <Field id="build-kind" label="Kind" errors={state.errors?.kind}>
          <Select id="build-kind" name="kind" key={state.values?.kind ?? "breadboard"} defaultValue={state.values?.kind ?? "breadboard"} aria-describedby={describedBy("build-kind")}>
            {Object.entries(BUILD_KIND_NAMES).map(([value, name]) => (
              <option key={value} value={value}>
                {name}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="build-kind-revision" label="Board revision" hint="Optional, e.g. rev B." errors={state.errors?.kindRevision}>
          <Input id="build-kind-revision" name="kindRevision" defaultValue={state.values?.kindRevision} maxLength={40} aria-describedby={describedBy("build-kind-revision")} />
        </Field>
      </div>
      <p className="text-xs text-ink-faint">The build starts with the design&apos;s current part values; tweaks change them from there.</p>
      <Button type="submit" disabled={pending}>
        {pending ? "Creating…" : "Create build"}
      </Button>
    </form>
  );
}
