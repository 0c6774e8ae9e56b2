"use client";

import { useActionState, type ReactNode } from "react";
import { Button, type ButtonProps } from "@/components/ui/button";
import type { FormState } from "@/lib/auth/action-state";
import { cn } from "@/lib/utils";

export interface InlineActionFormProps {
  action: (prev: FormState, formData: FormData) => Promise<FormState>;
  /** Hidden ids and the few controls of a row action. */
  children?: ReactNode;
  submitLabel: string;
  pendingLabel?: string;
  variant?: ButtonProps["variant"];
  /** Accessible name of the button when the visible label is ambiguous in a table row. */
  submitAriaLabel?: string;
  className?: string;
}

/** A one-button form for table rows (resend, revoke, change role): its outcome appears right beside it. */
export function InlineActionForm({ action, children, submitLabel, pendingLabel, variant = "secondary", submitAriaLabel, className }: InlineActionFormProps) {
  const [state, formAction, pending] = useActionState<FormState, FormData>(action, {});
  return (
    <form action={formAction} className={cn("flex flex-wrap items-center gap-2", className)}>
      {children}
      <Button type="submit" size="sm" variant={variant} disabled={pending} aria-label={submitAriaLabel}>
        {pending ? (pendingLabel ?? "Working…") : submitLabel}
      </Button>
      <span aria-live="polite" className={cn("text-xs", state.ok ? "text-verdict-pass" : "text-verdict-fail")}>
        {state.message ?? (state.errors ? Object.values(state.errors).flat().join(" ") : null)}
      </span>
    </form>
  );
}
