import Link from "next/link";
import { ruleName } from "@/components/review/rule-name";
import type { Flag } from "@/db/queries/flags";
import { formatDateTime } from "@/lib/format/dates";

/** Open flags of one rule on earlier runs, worded from the most recent one. */
export interface FlagGroup {
  latest: Flag;
  count: number;
}

/** One group per rule, each keeping its most recent flag and how many runs broke it. */
export function groupFlagsByRule(flags: readonly Flag[]): FlagGroup[] {
  const byRule = new Map<string, FlagGroup>();
  for (const f of flags) {
    const seen = byRule.get(f.rule);
    if (!seen) byRule.set(f.rule, { latest: f, count: 1 });
    else {
      seen.count += 1;
      if (new Date(f.createdAt).getTime() > new Date(seen.latest.createdAt).getTime()) seen.latest = f;
    }
  }
  return [...byRule.values()];
}

/**
 * The build's broken rules, split so the page never contradicts its state chip: what the latest run broke
 * (the state, in red) and what earlier runs broke and nobody has acknowledged yet (history, each with its run).
 */
export function BrokenRulesNotice({
  current,
  older,
  latestRun,
}: {
  current: readonly Flag[];
  older: readonly FlagGroup[];
  latestRun: { id: string; originalFilename: string; createdAt: Date | string } | null;
}) {
  if (current.length === 0 && older.length === 0) return null;
  return (
    <div className="mb-4 space-y-3">
      {current.length > 0 && latestRun ? (
        <div role="alert" className="rounded-lg border border-verdict-fail/40 bg-verdict-failBg px-4 py-3 text-sm">
          <p className="font-semibold text-verdict-fail">
            <span aria-hidden="true">⚑ </span>
            The latest run breaks {current.length} spec rule{current.length === 1 ? "" : "s"} (
            <Link className="underline underline-offset-2" href={`/runs/${latestRun.id}`}>
              {latestRun.originalFilename}
            </Link>
            , {formatDateTime(latestRun.createdAt)})
          </p>
          <ul className="mt-1 list-disc space-y-0.5 pl-5 text-ink">
            {current.map((f) => (
              <li key={f.id}>{f.message}</li>
            ))}
          </ul>
        </div>
      ) : null}
      {older.length > 0 ? (
        <details className="rounded-lg border border-rule bg-paper-raised px-4 py-3 text-sm">
          <summary className="cursor-pointer font-medium text-ink">
            History: {older.length} rule{older.length === 1 ? "" : "s"} broken on earlier runs, not yet acknowledged
          </summary>
          <ul className="mt-2 space-y-1 text-ink-soft">
            {older.map(({ latest, count }) => (
              <li key={latest.rule}>
                <span className="font-medium text-ink">{ruleName(latest.rule)}</span>:{" "}
                <Link className="underline-offset-2 hover:underline" href={`/runs/${latest.runId}`}>
                  {latest.message}
                </Link>{" "}
                <span>
                  (last on the run of {formatDateTime(latest.createdAt)}
                  {count > 1 ? `; on ${count} runs` : ""})
                </span>
              </li>
            ))}
          </ul>
        </details>
      ) : null}
    </div>
  );
}
