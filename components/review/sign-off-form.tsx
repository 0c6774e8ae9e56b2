"use client";

import { useActionState, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field, FormMessage, Textarea, describedBy } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { cn } from "@/lib/utils";
import { ruleName } from "./rule-name";

type Decision = "accept" | "reject" | "reopen";

export interface SignOffFormProps {
  /** signOffBuildAction bound to the build id. */
  action: (prev: FormState, formData: FormData) => Promise<FormState>;
  status: "open" | "accepted" | "rejected";
  /** Rules the latest analysed run broke; any at all make the reason required to accept. */
  flaggedRules: string[];
  /** Name of the latest analysed run, for the reason's hint. */
  latestRunName?: string | null;
}

const CHOICES: Record<Decision, { label: string; icon: string; hint: string }> = {
  accept: { label: "Accept", icon: "✓", hint: "The build meets its purpose; it is signed off." },
  reject: { label: "Reject", icon: "✕", hint: "The build is not fit; say why." },
  reopen: { label: "Reopen", icon: "↺", hint: "More work to do: the sign-off is cleared." },
};

/**
 * Accept, reject or reopen a build (engineers and admins). Accepting a build whose latest run is flagged asks for
 * the reason, which is kept with the build and in the audit log; the server checks the same rule.
 */
export function SignOffForm({ action, status, flaggedRules, latestRunName }: SignOffFormProps) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  const decisions: Decision[] = status === "open" ? ["accept", "reject"] : status === "accepted" ? ["reopen", "reject"] : ["reopen", "accept"];
  const kept = state.ok ? undefined : state.values;
  const [decision, setDecision] = useState<Decision>((kept?.decision as Decision | undefined) ?? decisions[0]);
  const current = decisions.includes(decision) ? decision : decisions[0];
  const flagged = flaggedRules.length > 0;
  const needsReason = current === "accept" && flagged;
  const errors = state.ok ? {} : (state.errors ?? {});

  return (
    <form action={formAction} className="space-y-3" aria-label="Sign off this build" noValidate>
      <fieldset>
        <legend className="text-sm font-medium text-ink">Decision</legend>
        <div className="mt-1.5 flex flex-wrap gap-2">
          {decisions.map((d) => (
            <label
              key={d}
              className={cn(
                "flex cursor-pointer items-center gap-1.5 rounded-md border px-3 py-1.5 text-sm font-medium has-[:focus-visible]:outline-2 has-[:focus-visible]:outline-offset-2 has-[:focus-visible]:outline-copper",
                current === d ? "border-copper bg-copper-light text-copper-dark" : "border-rule-strong bg-paper-raised text-ink hover:bg-paper-sunk",
              )}
            >
              <input type="radio" name="decision" value={d} checked={current === d} onChange={() => setDecision(d)} className="sr-only" />
              <span aria-hidden="true">{CHOICES[d].icon}</span>
              {CHOICES[d].label}
            </label>
          ))}
        </div>
        <p className="mt-1 text-xs text-ink-faint">{CHOICES[current].hint}</p>
        {errors.decision ? <p className="text-xs font-medium text-verdict-fail">{errors.decision.join(" ")}</p> : null}
      </fieldset>

      {needsReason ? (
        <div className="rounded-md border border-verdict-fail/40 bg-verdict-failBg/60 px-3 py-2.5">
          <Field
            id="sign-off-reason"
            label="Reason for accepting a flagged build (required)"
            hint={
              <>
                The latest run{latestRunName ? ` (${latestRunName})` : ""} breaks: {flaggedRules.map(ruleName).join(", ")}. The reason is kept with the
                build and in the audit log.
              </>
            }
            errors={errors.reason}
          >
            <Textarea
              id="sign-off-reason"
              name="reason"
              rows={3}
              required
              aria-required="true"
              maxLength={2000}
              defaultValue={kept?.reason ?? ""}
              key={`reason-${state.message ?? ""}`}
              aria-describedby={describedBy("sign-off-reason")}
              aria-invalid={errors.reason ? true : undefined}
              placeholder="e.g. H2 is removed by the low-pass filter on the product board."
            />
          </Field>
        </div>
      ) : null}

      <Field
        id="sign-off-comment"
        label={current === "reject" ? "Why is it rejected? (required)" : "Comment (optional)"}
        hint={current === "reject" ? "Shown on the build and in its report." : "Shown with the sign-off on the build and in its report."}
        errors={errors.comment}
      >
        <Textarea
          id="sign-off-comment"
          name="comment"
          rows={2}
          maxLength={2000}
          required={current === "reject"}
          defaultValue={kept?.comment ?? ""}
          key={`comment-${state.message ?? ""}`}
          aria-describedby={describedBy("sign-off-comment")}
          aria-invalid={errors.comment ? true : undefined}
        />
      </Field>

      <div className="flex flex-wrap items-center gap-3">
        <Button type="submit" variant={current === "reject" ? "danger" : "primary"} disabled={pending}>
          {pending ? "Saving…" : current === "accept" ? (flagged ? "Accept despite the flags" : "Accept the build") : current === "reject" ? "Reject the build" : "Reopen the build"}
        </Button>
      </div>
      <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
    </form>
  );
}
