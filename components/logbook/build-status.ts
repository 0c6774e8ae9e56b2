import type { Verdict } from "@/components/ui/verdict-badge";
import type { RunVerdict } from "@/lib/spec/types";

/** The badge of a build from its review status and its latest run (issue 7 refines "in spec / flagged"). */
export function buildBadge(status: "open" | "accepted" | "rejected", latest: { status: string; verdict: RunVerdict | null } | null): { verdict: Verdict; label?: string } {
  if (status === "accepted") return { verdict: "accepted" };
  if (status === "rejected") return { verdict: "rejected" };
  if (!latest) return { verdict: "none", label: "No runs" };
  if (latest.status === "failed") return { verdict: "failed-analysis" };
  if (latest.status !== "done") return { verdict: "pending" };
  if (latest.verdict === "fail") return { verdict: "flagged" };
  if (latest.verdict === "pass") return { verdict: "pass", label: "In spec" };
  if (latest.verdict === "inconclusive") return { verdict: "inconclusive", label: "Cannot judge" };
  return { verdict: "none", label: "No spec" };
}

/** A run's badge from its analysis status and verdict. */
export function runBadge(run: { status: string; verdict: RunVerdict | null }): Verdict {
  if (run.status === "failed") return "failed-analysis";
  if (run.status !== "done") return "pending";
  return run.verdict ?? "none";
}

export const BUILD_KIND_NAMES: Record<string, string> = {
  breadboard: "Breadboard",
  perfboard: "Perfboard",
  pcb: "PCB",
  other: "Other",
};
