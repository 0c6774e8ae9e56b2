import Link from "next/link";
import { runBadge } from "@/components/logbook/build-status";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { EmptyState } from "@/components/ui/empty-state";
import { VerdictBadge } from "@/components/ui/verdict-badge";
import type { DashboardRun } from "@/db/queries/dashboard";
import { formatDateTime } from "@/lib/format/dates";
import { formatDriftLeading, formatPercent, formatWithUncertainty } from "@/lib/format/numbers";

/** The newest runs across every project: when, which build, what it measured and its verdict. */
export function LatestRunsTable({ runs, emptyHint }: { runs: DashboardRun[]; emptyHint: string }) {
  if (runs.length === 0) {
    return <EmptyState title="No runs yet">{emptyHint}</EmptyState>;
  }
  return (
    <Table caption="Latest runs across projects, newest first">
      <thead>
        <tr>
          <Th>Uploaded · file</Th>
          <Th>Build</Th>
          <Th className="text-right">Measured f</Th>
          <Th className="hidden text-right sm:table-cell">Drift</Th>
          <Th className="hidden text-right md:table-cell">THD</Th>
          <Th>Verdict</Th>
        </tr>
      </thead>
      <tbody>
        {runs.map((r) => {
          const f = formatWithUncertainty(r.measuredHz, r.frequencyUncertaintyHz, "Hz", 6, 8);
          const drift = formatDriftLeading(r.driftPpm);
          return (
            <Tr key={r.id}>
              <Td>
                <span className="num block whitespace-nowrap font-mono text-[12px] text-ink-soft">{formatDateTime(r.createdAt)}</span>
                <Link href={`/runs/${r.id}`} className="block max-w-[14rem] truncate text-sm text-ink hover:text-copper hover:underline">
                  <bdi>{r.originalFilename}</bdi>
                </Link>
                <span className="block text-[11px] text-ink-faint">by <bdi>{r.createdByName}</bdi></span>
              </Td>
              <Td className="text-sm">
                <Link href={`/builds/${r.buildId}`} className="font-medium text-ink hover:text-copper hover:underline">
                  <bdi>{r.buildLabel}</bdi>
                </Link>
                <span className="block max-w-[12rem] truncate text-xs text-ink-faint">
                  <bdi>{r.projectName}</bdi> › <bdi>{r.designName}</bdi>
                </span>
              </Td>
              <Td numeric className="whitespace-nowrap">
                <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                  {f.value}
                </Link>
                {f.uncertainty ? <span className="block text-[11px] text-ink-faint">{f.uncertainty}</span> : null}
              </Td>
              <Td numeric className="hidden whitespace-nowrap sm:table-cell">
                <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                  {drift.main}
                </Link>
              </Td>
              <Td numeric className="hidden whitespace-nowrap md:table-cell">
                <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                  {formatPercent(r.thdPercent)}
                </Link>
              </Td>
              <Td>
                <VerdictBadge verdict={runBadge(r)} className="whitespace-nowrap" />
              </Td>
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}
