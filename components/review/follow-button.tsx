"use client";

import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import type { FormState } from "@/lib/auth/action-state";
import { cn } from "@/lib/utils";

export interface FollowButtonProps {
  /** followBuildAction or followProjectAction bound to its id. */
  action: (prev: FormState, formData: FormData) => Promise<FormState>;
  /** "build" or "project": the words on the button. */
  target: "build" | "project";
  following: boolean;
  /** Why the person follows, in a few words (e.g. "you built it"), shown under the button. */
  reason?: string | null;
}

/** Follow or unfollow a build or a project: followers get one e-mail when a run raises a flag. */
export function FollowButton({ action, target, following, reason }: FollowButtonProps) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  return (
    <form action={formAction} className="flex flex-col items-start gap-1">
      <input type="hidden" name="following" value={following ? "false" : "true"} />
      <Button type="submit" size="sm" variant="secondary" disabled={pending} aria-pressed={following}>
        <span aria-hidden="true">{following ? "★" : "☆"}</span>
        {pending ? "Saving…" : following ? `Following this ${target}` : `Follow this ${target}`}
      </Button>
      <span aria-live="polite" className={cn("max-w-xs text-xs", state.ok || !state.message ? "text-ink-faint" : "text-verdict-fail")}>
        {state.message ?? (following ? `${reason ? `${reason[0].toUpperCase()}${reason.slice(1)}. ` : ""}Press to stop the flag e-mails.` : "Get an e-mail when a run raises a flag.")}
      </span>
    </form>
  );
}
