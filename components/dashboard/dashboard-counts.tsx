import Link from "next/link";
import type { BuildState } from "@/db/queries/dashboard";
import { cn } from "@/lib/utils";

export interface DashboardCountsProps {
  buildsByState: Record<BuildState, number>;
  needingAttention: number;
  runsLast7Days: number;
  /** Link for a state filter of the all-builds table. */
  stateHref: (states: BuildState[]) => string;
}

function Tile({ href, label, value, note, tone }: { href: string; label: string; value: number; note?: string; tone?: "fail" | "pass" }) {
  return (
    <li>
      <Link
        href={href}
        className="block h-full rounded-lg border border-rule bg-paper-raised px-3 py-2.5 hover:border-copper focus-visible:border-copper"
      >
        <span className="block text-xs font-medium text-ink-soft">{label}</span>
        <span
          className={cn(
            "num block font-mono text-2xl font-semibold leading-tight",
            tone === "fail" && value > 0 ? "text-verdict-fail" : tone === "pass" ? "text-verdict-pass" : "text-ink",
          )}
        >
          {value}
        </span>
        {note ? <span className="block text-xs text-ink-faint">{note}</span> : null}
      </Link>
    </li>
  );
}

/** Head counts, each a link to the list it counts. */
export function DashboardCounts({ buildsByState, needingAttention, runsLast7Days, stateHref }: DashboardCountsProps) {
  const open = buildsByState["no-runs"] + buildsByState.unchecked + buildsByState["in-spec"] + buildsByState["cannot-judge"] + buildsByState.flagged;
  return (
    <ul className="grid grid-cols-2 gap-3 sm:grid-cols-3 lg:grid-cols-6" aria-label="Builds and runs at a glance">
      <Tile href="#attention" label="Need attention" value={needingAttention} note="flagged or outside the band" tone="fail" />
      <Tile href={stateHref(["flagged"])} label="Flagged" value={buildsByState.flagged} note="latest run broke the spec" tone="fail" />
      <Tile href={stateHref(["in-spec"])} label="In spec" value={buildsByState["in-spec"]} note="latest run passed" />
      <Tile href={stateHref(["accepted", "rejected"])} label="Signed off" value={buildsByState.accepted + buildsByState.rejected} note={`${buildsByState.accepted} accepted, ${buildsByState.rejected} rejected`} />
      <Tile
        href={stateHref(["no-runs", "unchecked", "in-spec", "cannot-judge", "flagged"])}
        label="Open builds"
        value={open}
        note={`not signed off; ${buildsByState["no-runs"]} without runs${buildsByState["cannot-judge"] ? `, ${buildsByState["cannot-judge"]} cannot be judged` : ""}`}
      />
      <Tile href="#latest-runs" label="Runs, last 7 days" value={runsLast7Days} note="uploaded captures" />
    </ul>
  );
}
