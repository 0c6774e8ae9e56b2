import { VerdictBadge, type Verdict } from "@/components/ui/verdict-badge";
import type { BuildState } from "@/db/queries/dashboard";

const LOOK: Record<BuildState, { verdict: Verdict; label?: string }> = {
  "no-runs": { verdict: "none", label: "No runs" },
  unchecked: { verdict: "none", label: "Unchecked" },
  "in-spec": { verdict: "pass", label: "In spec" },
  "cannot-judge": { verdict: "inconclusive", label: "Cannot judge" },
  flagged: { verdict: "flagged" },
  accepted: { verdict: "accepted" },
  rejected: { verdict: "rejected" },
};

/** Words for each build state, for filters and legends. */
export const BUILD_STATE_WORDS: Record<BuildState, string> = {
  "no-runs": "No runs",
  unchecked: "Unchecked",
  "in-spec": "In spec",
  "cannot-judge": "Cannot judge",
  flagged: "Flagged",
  accepted: "Accepted",
  rejected: "Rejected",
};

/** A build's state (no runs, unchecked, in spec, cannot judge, flagged, accepted, rejected) in word and icon. */
export function BuildStateBadge({ state, className }: { state: BuildState; className?: string }) {
  const look = LOOK[state];
  return <VerdictBadge verdict={look.verdict} label={look.label} className={className} />;
}
