"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import { describedBy, Field, FormMessage, Input } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";

/**
 * The accuracy of the scope's timebase on this build's bench (± ppm, from its data sheet or calibration): absolute
 * frequencies then carry it in their uncertainty, and a frequency rule inside its window by less than it reads
 * "cannot judge". Empty clears it.
 */
export function TimebaseForm({
  action,
  timebasePpm,
}: {
  action: (prev: FormState, formData: FormData) => Promise<FormState>;
  timebasePpm: number | null;
}) {
  const [state, formAction, pending] = useActionState<FormState, FormData>(action, {});
  const id = "timebase-ppm";
  return (
    <form action={formAction} aria-label="Scope timebase accuracy" className="space-y-2">
      <Field
        id={id}
        label="Scope timebase accuracy (± ppm)"
        hint="From the scope's data sheet or its calibration, e.g. 25. Leave empty if unknown. Verdicts already stored change when a run is re-analysed."
        errors={state.errors?.timebasePpm}
      >
        <Input
          id={id}
          name="timebasePpm"
          inputMode="decimal"
          defaultValue={timebasePpm === null ? "" : String(timebasePpm)}
          aria-describedby={describedBy(id)}
          aria-invalid={state.errors?.timebasePpm ? true : undefined}
          className="w-32"
        />
      </Field>
      <div className="flex flex-wrap items-center gap-2">
        <Button type="submit" size="sm" variant="secondary" disabled={pending}>
          {pending ? "Saving…" : "Save"}
        </Button>
        <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
      </div>
    </form>
  );
}
