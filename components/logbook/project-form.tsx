"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Input, Textarea, describedBy } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";

export interface ProjectFormProps {
  action: (state: FormState, formData: FormData) => Promise<FormState>;
  initial?: { name: string; purpose: string };
  submitLabel?: string;
}

/** Name and purpose of a project; errors beside the fields. */
export function ProjectForm({ action, initial, submitLabel = "Create project" }: ProjectFormProps) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  return (
    <form action={formAction} className="space-y-3" noValidate>
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      <Field id="project-name" label="Name" errors={state.errors?.name}>
        <Input
          id="project-name"
          name="name"
          required
          maxLength={120}
          defaultValue={state.values?.name ?? initial?.name}
          aria-describedby={describedBy("project-name")}
          aria-invalid={state.errors?.name ? true : undefined}
        />
      </Field>
      <Field id="project-purpose" label="Purpose" hint="What the oscillators are for: the product, the band, the constraint." errors={state.errors?.purpose}>
        <Textarea
          id="project-purpose"
          name="purpose"
          rows={3}
          maxLength={2000}
          defaultValue={state.values?.purpose ?? initial?.purpose}
          aria-describedby={describedBy("project-purpose")}
          aria-invalid={state.errors?.purpose ? true : undefined}
        />
      </Field>
      <Button type="submit" disabled={pending}>
        {pending ? "Saving…" : submitLabel}
      </Button>
    </form>
  );
}
