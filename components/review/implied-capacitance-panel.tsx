import Link from "next/link";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import type { ImpliedCapacitanceTrend, ImpliedCapacitanceVerdict } from "@/lib/drift-trend/implied-capacitance";
import { DASH, formatSignedCapacitance, formatSignedPicofarads } from "@/lib/format/numbers";
import { cn } from "@/lib/utils";
import type { ImpliedRunRow } from "./build-review-data";

export interface ImpliedCapacitancePanelProps {
  rows: ImpliedRunRow[];
  trend: ImpliedCapacitanceTrend;
  /** lib/oscillator's explanation of the latest run's drift and its sign. */
  latestExplanation: string | null;
  latestSignPhrase: string | null;
  /** Show every run (report) or only the newest few (build page). */
  limit?: number;
}

const VERDICT_LOOK: Record<ImpliedCapacitanceVerdict, { word: string; icon: string; className: string }> = {
  steady: { word: "Steady across tweaks", icon: "═", className: "border-verdict-pass/50 bg-verdict-passBg text-verdict-pass" },
  changing: { word: "Moved by the tweaks", icon: "↕", className: "border-verdict-warn/50 bg-verdict-warnBg text-verdict-warn" },
  untested: { word: "No tweak between runs yet", icon: "?", className: "border-verdict-idle/40 bg-verdict-idleBg text-verdict-idle" },
  "too-few-runs": { word: "Too few runs", icon: "–", className: "border-verdict-idle/40 bg-verdict-idleBg text-verdict-idle" },
};

const SIGN_WORD = { more: "extra", less: "short", none: "none" } as const;

function uncertaintyText(uF: number | null): string {
  if (uF === null || uF <= 0) return "";
  // Below 0.01 pF the figure is noise next to any layout stray; say so rather than print zeros.
  return uF < 0.005e-12 ? "± <0.01 pF" : `± ${formatSignedPicofarads(uF, 2).replace(/^\+/, "")}`;
}

/**
 * The implied extra capacitance per run (signed, with what its sign means) and the verdict on its trend: steady
 * across tweaks is a layout parasitic to design in; changing means the tweaks themselves moved it.
 */
export function ImpliedCapacitancePanel({ rows, trend, latestExplanation, latestSignPhrase, limit }: ImpliedCapacitancePanelProps) {
  const look = VERDICT_LOOK[trend.verdict];
  const shown = limit !== undefined && rows.length > limit ? rows.slice(-limit) : rows;
  const segmentStart = new Set<number>();
  let last = -1;
  for (const r of rows) {
    if (r.segment !== last && r.index > 1) segmentStart.add(r.index);
    last = r.segment;
  }
  return (
    <div className="space-y-3">
      <div className="flex flex-wrap items-start gap-3">
        <span className={cn("inline-flex shrink-0 items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-semibold", look.className)}>
          <span aria-hidden="true">{look.icon}</span>
          {look.word}
        </span>
        {trend.typicalF !== null ? (
          <span className="num font-mono text-lg font-semibold leading-tight text-ink">
            {formatSignedCapacitance(trend.typicalF)}
            <span className="ml-2 font-sans text-xs font-normal text-ink-faint">typical</span>
          </span>
        ) : null}
      </div>
      <p className="text-sm text-ink">{trend.summary}</p>
      {latestSignPhrase ? <p className="text-sm text-ink-soft">{latestSignPhrase}</p> : null}
      {latestExplanation ? (
        <details className="text-sm">
          <summary className="cursor-pointer text-xs font-medium text-ink-soft hover:text-ink">The latest run in detail</summary>
          <p className="mt-1 rounded-md bg-paper-sunk/60 px-3 py-2 leading-relaxed text-ink">{latestExplanation}</p>
        </details>
      ) : null}
      {shown.length > 0 ? (
        <Table caption="Implied extra capacitance per analysed run">
          <thead>
            <tr>
              <Th className="w-12 text-right">Run</Th>
              <Th>File</Th>
              <Th className="text-right">Implied C</Th>
              <Th className="hidden sm:table-cell">Sign</Th>
            </tr>
          </thead>
          <tbody>
            {shown.map((r) => (
              <Tr key={r.id} className={segmentStart.has(r.index) ? "border-t-2 border-t-trace-d/40" : undefined}>
                <Td numeric>#{r.index}</Td>
                <Td>
                  <Link href={`/runs/${r.id}`} className="block max-w-[14rem] truncate text-sm text-ink hover:text-copper hover:underline">
                    {r.originalFilename}
                  </Link>
                  {segmentStart.has(r.index) ? <span className="block text-[11px] text-trace-d">after a tweak</span> : null}
                </Td>
                <Td numeric className="whitespace-nowrap">
                  {r.impliedF === null ? DASH : formatSignedCapacitance(r.impliedF)}
                  {uncertaintyText(r.uncertaintyF) ? <span className="block text-[11px] text-ink-faint">{uncertaintyText(r.uncertaintyF)}</span> : null}
                </Td>
                <Td className="hidden text-xs text-ink-soft sm:table-cell">{r.sign ? SIGN_WORD[r.sign] : DASH}</Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      ) : null}
      {limit !== undefined && rows.length > limit ? <p className="text-xs text-ink-faint">The newest {limit} of {rows.length} analysed runs; the report lists them all.</p> : null}
      <p className="text-xs text-ink-faint">
        Positive: more capacitance than the design assumed (layout stray adds this way). Negative: less than modelled, which no stray can cause.
        Runs between the same two tweaks share a stretch; each stretch starts at a row marked “after a tweak”.
      </p>
    </div>
  );
}
