import Link from "next/link";
import { ruleName } from "@/components/review/rule-name";
import { BuildStateBadge } from "@/components/review/build-state-badge";
import { EmptyState } from "@/components/ui/empty-state";
import type { AttentionBuild } from "@/db/queries/dashboard";
import { formatDateTime } from "@/lib/format/dates";
import { formatDriftLeading, formatPercent, formatRange, formatWithUncertainty } from "@/lib/format/numbers";

/** Open builds whose latest run is flagged or measured outside its worst-case band, with the reasons. */
export function AttentionList({ builds, total }: { builds: AttentionBuild[]; total: number }) {
  if (builds.length === 0) {
    return (
      <EmptyState title="Nothing needs attention">
        Every open build&apos;s latest run is inside its spec and its predicted band. A flagged run or a measurement outside the worst-case band
        shows up here.
      </EmptyState>
    );
  }
  return (
    <div className="space-y-2">
      <ul className="grid gap-3 md:grid-cols-2">
        {builds.map((b) => {
          const r = b.latestRun;
          const f = formatWithUncertainty(r?.measuredHz, r?.frequencyUncertaintyHz, "Hz", 6, 8);
          const drift = formatDriftLeading(r?.driftPpm);
          return (
            <li key={b.id} className="rounded-lg border border-rule bg-paper-raised px-4 py-3">
              <div className="flex flex-wrap items-start justify-between gap-2">
                <div className="min-w-0">
                  <Link href={`/builds/${b.id}`} className="font-semibold text-ink hover:text-copper hover:underline">
                    <bdi>{b.label}</bdi>
                  </Link>
                  <p className="truncate text-xs text-ink-faint">
                    <Link href={`/projects/${b.projectId}`} className="hover:underline">
                      <bdi>{b.projectName}</bdi>
                    </Link>{" "}
                    ›{" "}
                    <Link href={`/projects/${b.projectId}/designs/${b.designId}`} className="hover:underline">
                      <bdi>{b.designName}</bdi>
                    </Link>
                  </p>
                </div>
                <BuildStateBadge state={b.state} />
              </div>
              <ul className="mt-2 space-y-1 text-sm" aria-label={`Why ${b.label} needs attention`}>
                {b.reasons.includes("flagged") ? (
                  <li className="flex gap-1.5">
                    <span aria-hidden="true" className="text-verdict-fail">
                      ⚑
                    </span>
                    <span>
                      Latest run breaks {b.failingRules.length > 0 ? b.failingRules.map(ruleName).join(", ") : "its spec"}
                      {b.unacknowledgedFlagCount > 0 ? (
                        <Link href={`/builds/${b.id}#flags`} className="ml-1 text-xs text-ink-soft underline underline-offset-2 hover:text-copper">
                          {b.unacknowledgedFlagCount} open {b.unacknowledgedFlagCount === 1 ? "flag" : "flags"}
                        </Link>
                      ) : null}
                    </span>
                  </li>
                ) : null}
                {b.reasons.includes("outside-band") ? (
                  <li className="flex gap-1.5">
                    <span aria-hidden="true" className="text-verdict-warn">
                      ↕
                    </span>
                    <span>
                      Measured outside the worst-case band
                      {r?.worstCase ? <span className="num font-mono text-xs text-ink-soft"> ({formatRange(r.worstCase.minHz, r.worstCase.maxHz, "Hz", 5)})</span> : null}: tolerances
                      alone cannot explain it
                    </span>
                  </li>
                ) : null}
              </ul>
              {r ? (
                <dl className="num mt-2 grid grid-cols-3 gap-2 border-t border-rule/70 pt-2 font-mono text-[13px]">
                  <div>
                    <dt className="font-sans text-[11px] text-ink-faint">Measured</dt>
                    <dd>
                      <Link href={`/runs/${r.id}`} className="text-ink hover:text-copper hover:underline">
                        {f.value}
                      </Link>
                    </dd>
                  </div>
                  <div>
                    <dt className="font-sans text-[11px] text-ink-faint">Drift</dt>
                    <dd>
                      <Link href={`/runs/${r.id}`} className="text-ink hover:text-copper hover:underline">
                        {drift.main}
                      </Link>
                    </dd>
                  </div>
                  <div>
                    <dt className="font-sans text-[11px] text-ink-faint">THD</dt>
                    <dd>
                      <Link href={`/runs/${r.id}`} className="text-ink hover:text-copper hover:underline">
                        {formatPercent(r.thdPercent)}
                      </Link>
                    </dd>
                  </div>
                </dl>
              ) : null}
              {r ? <p className="mt-1 text-[11px] text-ink-faint">Latest run {formatDateTime(r.createdAt)}</p> : null}
            </li>
          );
        })}
      </ul>
      {total > builds.length ? <p className="text-xs text-ink-faint">The {builds.length} most recently measured of {total}.</p> : null}
    </div>
  );
}
