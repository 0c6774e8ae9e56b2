import Link from "next/link";
import { BuildStateBadge } from "@/components/review/build-state-badge";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import type { BuildTableRow } from "@/db/queries/dashboard";
import { DASH, formatDriftLeading, formatPercent, formatWithUncertainty } from "@/lib/format/numbers";

/** The builds a person made or follows, with their state and latest numbers (most recently measured first). */
export function MyBuildsList({ builds }: { builds: BuildTableRow[] }) {
  return (
    <Table caption="Builds you made or follow">
      <thead>
        <tr>
          <Th>Build</Th>
          <Th>State</Th>
          <Th className="text-right">Latest measured</Th>
          <Th className="hidden text-right sm:table-cell">Drift</Th>
          <Th className="hidden text-right sm:table-cell">THD</Th>
        </tr>
      </thead>
      <tbody>
        {builds.map((b) => {
          const r = b.latestRun;
          const f = formatWithUncertainty(r?.measuredHz, r?.frequencyUncertaintyHz, "Hz", 6, 8);
          const drift = formatDriftLeading(r?.driftPpm);
          return (
            <Tr key={b.id}>
              <Td>
                <Link href={`/builds/${b.id}`} className="font-medium text-ink hover:text-copper hover:underline">
                  <bdi>{b.label}</bdi>
                </Link>
                <span className="block max-w-[14rem] truncate text-xs text-ink-faint">
                  <bdi>{b.projectName}</bdi> › <bdi>{b.designName}</bdi>
                </span>
              </Td>
              <Td>
                <BuildStateBadge state={b.state} className="whitespace-nowrap" />
              </Td>
              <Td numeric className="whitespace-nowrap">
                {r ? (
                  <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                    {f.value}
                  </Link>
                ) : (
                  DASH
                )}
              </Td>
              <Td numeric className="hidden whitespace-nowrap sm:table-cell">
                {r ? (
                  <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                    {drift.main}
                  </Link>
                ) : (
                  DASH
                )}
              </Td>
              <Td numeric className="hidden whitespace-nowrap sm:table-cell">
                {r ? (
                  <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                    {formatPercent(r.thdPercent)}
                  </Link>
                ) : (
                  DASH
                )}
              </Td>
            </Tr>
          );
        })}
      </tbody>
    </Table>
  );
}
