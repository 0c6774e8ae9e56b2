import Link from "next/link";
import { runBadge } from "@/components/logbook/build-status";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { VerdictBadge } from "@/components/ui/verdict-badge";
import type { RunSummary } from "@/db/queries/runs";
import { formatDateTime } from "@/lib/format/dates";
import { formatDecibels, formatDriftLeading, formatPercent, formatWithUncertainty } from "@/lib/format/numbers";

export interface ReportRunsTableProps {
  /** Runs oldest first, as the report reads. */
  runs: RunSummary[];
  /** The tweak each run follows, in words, by tweak id. */
  tweakText: Record<string, string>;
  /** Run numbers on the charts, by run id (analysed runs only). */
  chartIndex: Record<string, number>;
}

/** Every run of the build, oldest first: what it measured, how far from the prediction, distortion and verdict. */
export function ReportRunsTable({ runs, tweakText, chartIndex }: ReportRunsTableProps) {
  return (
    <Table caption="Runs of this build, oldest first" className="print:overflow-visible">
      <thead>
        <tr>
          <Th className="w-10 text-right">#</Th>
          <Th>Uploaded · file</Th>
          <Th className="text-right">Measured f</Th>
          <Th className="text-right">Drift</Th>
          <Th className="text-right">THD</Th>
          <Th className="hidden text-right sm:table-cell print:table-cell">Worst harm.</Th>
          <Th>Verdict</Th>
        </tr>
      </thead>
      <tbody>
        {runs.map((r) => {
          const f = formatWithUncertainty(r.measuredHz, r.frequencyUncertaintyHz, "Hz", 6, 8);
          const drift = formatDriftLeading(r.driftPpm);
          return (
            <Tr key={r.id} className="break-inside-avoid">
              <Td numeric>{chartIndex[r.id] ?? ""}</Td>
              <Td>
                <span className="num block font-mono text-[12px] text-ink-soft">{formatDateTime(r.createdAt)}</span>
                <Link href={`/runs/${r.id}`} className="block max-w-[15rem] truncate text-sm text-ink hover:text-copper hover:underline print:max-w-none print:whitespace-normal">
                  {r.originalFilename}
                </Link>
                {r.tweakId && tweakText[r.tweakId] ? <span className="block text-xs text-ink-faint">after {tweakText[r.tweakId]}</span> : null}
                {r.withdrawnAt ? (
                  <span className="block text-xs text-ink-soft" data-withdrawn="true">
                    <span aria-hidden="true">⊘ </span>
                    <span className="font-medium">Withdrawn</span>: {r.withdrawalReason} · not in the charts or the verdict
                  </span>
                ) : null}
              </Td>
              <Td numeric className="whitespace-nowrap">
                {f.value}
                {f.uncertainty ? <span className="block text-[11px] text-ink-faint">{f.uncertainty}</span> : null}
              </Td>
              <Td numeric className="whitespace-nowrap">{drift.main}</Td>
              <Td numeric className="whitespace-nowrap">{formatPercent(r.thdPercent)}</Td>
              <Td numeric className="hidden whitespace-nowrap sm:table-cell print:table-cell">{formatDecibels(r.worstHarmonicDbc, "dBc")}</Td>
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
