import Link from "next/link";
import type { RunSummary } from "@/db/queries/runs";
import type { Tweak } from "@/db/queries/tweaks";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { VerdictBadge } from "@/components/ui/verdict-badge";
import type { Topology } from "@/lib/oscillator/design";
import { formatDateTime } from "@/lib/format/dates";
import { formatDrift, formatThd, formatWithUncertainty } from "@/lib/format/numbers";
import type { FormState } from "@/lib/auth/action-state";
import { ApplyTweakButton } from "./apply-tweak-button";
import { runBadge } from "./build-status";
import { tweakLabel, TweakText } from "./tweak-label";

export type TimelineItem = { kind: "tweak"; at: Date; tweak: Tweak } | { kind: "run"; at: Date; run: RunSummary };

/** Runs and tweaks merged, newest first (ties: the run after the tweak it follows). */
export function mergeTimeline(runs: RunSummary[], tweaks: Tweak[]): TimelineItem[] {
  const items: TimelineItem[] = [
    ...runs.map((run) => ({ kind: "run" as const, at: new Date(run.createdAt), run })),
    ...tweaks.map((tweak) => ({ kind: "tweak" as const, at: new Date(tweak.createdAt), tweak })),
  ];
  return items.sort((a, b) => b.at.getTime() - a.at.getTime() || (a.kind === "run" ? -1 : 1));
}

/**
 * The build's story in one table: each run (time, the tweak it follows, measured f, drift, THD, verdict) with the
 * tweak log interleaved in time order, newest first. With `applyTweak` (for the roles that may tweak) each planned
 * tweak carries the control that applies it once the part is fitted.
 */
export function BuildTimeline({
  items,
  topology,
  tweaksById,
  applyTweak,
}: {
  items: TimelineItem[];
  topology: Topology;
  tweaksById: Map<string, Tweak>;
  applyTweak?: (prev: FormState, formData: FormData) => Promise<FormState>;
}) {
  return (
    <Table caption="Runs and tweaks of this build, newest first">
      <thead>
        <tr>
          <Th className="w-36">Time</Th>
          <Th>Run or tweak</Th>
          <Th className="text-right">Measured f</Th>
          <Th className="text-right">Drift</Th>
          <Th className="hidden text-right sm:table-cell">THD</Th>
          <Th>Verdict</Th>
        </tr>
      </thead>
      <tbody>
        {items.map((item) => {
          if (item.kind === "tweak") {
            const t = item.tweak;
            return (
              <Tr key={`t-${t.id}`} className="bg-paper-sunk/45">
                <Td className="num whitespace-nowrap font-mono text-[13px] text-ink-soft">{formatDateTime(t.createdAt)}</Td>
                <Td colSpan={5}>
                  <span className="flex flex-wrap items-start gap-2 text-sm">
                    <span aria-hidden="true" className="text-copper">
                      ✎
                    </span>
                    <span className="min-w-0 flex-1">
                      <span className="font-medium text-ink">{t.planned ? "Planned tweak: " : "Tweak: "}</span>
                      <TweakText tweak={t} topology={topology} />
                      <span className="text-ink-faint"> · {t.createdByName}</span>
                    </span>
                    {t.planned && applyTweak ? <ApplyTweakButton action={applyTweak} tweakId={t.id} label={tweakLabel(t, topology)} /> : null}
                  </span>
                </Td>
              </Tr>
            );
          }
          const r = item.run;
          const f = formatWithUncertainty(r.measuredHz, r.frequencyUncertaintyHz, "Hz", 6, 8);
          const drift = formatDrift(r.driftPpm);
          const thd = formatThd(r.thdPercent === null ? null : r.thdPercent / 100);
          const follows = r.tweakId ? tweaksById.get(r.tweakId) : undefined;
          return (
            <Tr key={`r-${r.id}`} className={r.withdrawnAt ? "opacity-70" : undefined}>
              <Td className="num whitespace-nowrap font-mono text-[13px]">
                <Link href={`/runs/${r.id}`} className="text-ink underline-offset-2 hover:text-copper hover:underline">
                  {formatDateTime(r.createdAt)}
                </Link>
              </Td>
              <Td>
                <Link href={`/runs/${r.id}`} className="block max-w-[16rem] truncate text-sm font-medium text-ink hover:text-copper hover:underline">
                  {r.originalFilename}
                </Link>
                <span className="block text-xs text-ink-faint">
                  {follows ? `after ${tweakLabel(follows, topology)}` : "as built"}
                  {r.duplicateOfRunId ? " · kept duplicate" : ""}
                </span>
                {r.withdrawnAt ? (
                  <span className="mt-0.5 block text-xs text-ink-soft" data-withdrawn="true">
                    <span aria-hidden="true">⊘ </span>
                    <span className="font-medium">Withdrawn</span>: {r.withdrawalReason} · left out of the charts, the verdict and the lab&apos;s figures
                  </span>
                ) : null}
              </Td>
              <Td numeric className="whitespace-nowrap">
                {f.value}
                {f.uncertainty ? <span className="block text-[11px] text-ink-faint">{f.uncertainty}</span> : null}
              </Td>
              <Td numeric className="whitespace-nowrap">
                {drift.ppm}
                <span className="block text-[11px] text-ink-faint">{drift.percent}</span>
              </Td>
              <Td numeric className="hidden whitespace-nowrap sm:table-cell">
                {thd.percent}
              </Td>
              <Td>
                <VerdictBadge verdict={runBadge(r)} />
              </Td>
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}
