"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import type { FormState } from "@/lib/auth/action-state";
import { cn } from "@/lib/utils";

export interface ApplyTweakButtonProps {
  /** applyPlannedTweakAction bound to the build id; reads the field `tweakId`. */
  action: (prev: FormState, formData: FormData) => Promise<FormState>;
  tweakId: string;
  /** The tweak in words ("C2 15 nF → 27 nF"), for the button's accessible name. */
  label: string;
}

/** "Apply now" beside a planned tweak: the part takes the planned value once it is fitted at the bench. */
export function ApplyTweakButton({ action, tweakId, label }: ApplyTweakButtonProps) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  return (
    <form action={formAction} className="flex flex-col items-start gap-1">
      <input type="hidden" name="tweakId" value={tweakId} />
      <Button type="submit" size="sm" variant="secondary" disabled={pending} aria-label={`Apply the planned tweak ${label}: the part is fitted`}>
        {pending ? "Applying…" : "Part fitted: apply"}
      </Button>
      {state.message ? (
        <span role="status" className={cn("max-w-xs text-xs", state.ok ? "text-ink-soft" : "text-verdict-fail")}>
          {state.message}
        </span>
      ) : null}
    </form>
  );
}
