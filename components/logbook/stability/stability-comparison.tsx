import type { StabilityResult } from "@/lib/analysis/stability/types";
import { formatDecibels, formatQuantity } from "@/lib/format/numbers";
import { readStability } from "./read-stability";

export interface StabilityComparisonProps {
  a: { label: string; results: unknown };
  b: { label: string; results: unknown };
}

type Cell = { text: string; title?: string };

const NOT_MEASURED: Cell = { text: "not measured" };

function at(atFloor: boolean, text: string): Cell {
  return atFloor ? { text: `≤ ${text}`, title: "At the capture's noise floor: an upper bound" } : { text };
}

interface Row {
  label: string;
  cell: (s: StabilityResult) => Cell;
}

function rowsFor(a: StabilityResult | null, b: StabilityResult | null): Row[] {
  const offsets = [...new Set([...(a?.phaseNoise.points ?? []), ...(b?.phaseNoise.points ?? [])].map((p) => p.offsetHz))].sort((x, y) => x - y);
  const rows: Row[] = [
    {
      label: "rms phase jitter",
      cell: (s) => (s.jitter.rmsJitterS === null ? NOT_MEASURED : at(s.jitter.atFloor, formatQuantity(s.jitter.rmsJitterS, "s", 3))),
    },
    ...offsets.map<Row>((offsetHz) => ({
      label: `𝓛 at ${formatQuantity(offsetHz, "Hz", 2, { trimZeros: true })}`,
      cell: (s) => {
        const p = s.phaseNoise.points.find((q) => q.offsetHz === offsetHz);
        return p ? at(p.atFloor, formatDecibels(p.dbcPerHz, "dBc/Hz")) : { text: "outside the record's band" };
      },
    })),
    {
      label: "Period jitter (rms)",
      cell: (s) => (s.periodJitter.rmsPeriodJitterS === null ? NOT_MEASURED : at(s.periodJitter.atFloor, formatQuantity(s.periodJitter.rmsPeriodJitterS, "s", 3))),
    },
    {
      label: "Cycle-to-cycle jitter (rms)",
      cell: (s) => (s.periodJitter.rmsCycleToCycleS === null ? NOT_MEASURED : at(s.periodJitter.atFloor, formatQuantity(s.periodJitter.rmsCycleToCycleS, "s", 3))),
    },
    {
      label: "Allan deviation, shortest τ",
      cell: (s) => {
        const p = s.allan.points[0];
        return p ? at(p.atFloor, `${p.adev.toExponential(2)} at ${formatQuantity(p.tauS, "s", 3)}`) : NOT_MEASURED;
      },
    },
    {
      label: "Start-up to 90 %",
      cell: (s) => (s.envelope.startUpS === null ? { text: s.envelope.kind === "start-up" ? "not measured" : "—" } : { text: formatQuantity(s.envelope.startUpS, "s", 3) }),
    },
    {
      label: "Ring-down Q",
      cell: (s) => (s.envelope.q === null ? { text: s.envelope.kind === "ring-down" ? "not measured" : "—" } : { text: `${s.envelope.q.toPrecision(4)} ± ${(s.envelope.qSigma ?? 0).toPrecision(2)}` }),
    },
  ];
  return rows;
}

/** The two runs' stability figures side by side; a run from an older engine reads "not measured" in every row. */
export function StabilityComparison({ a, b }: StabilityComparisonProps) {
  const ra = readStability(a.results);
  const rb = readStability(b.results);
  const sa = ra.status === "measured" ? ra.stability : null;
  const sb = rb.status === "measured" ? rb.stability : null;
  if (!sa && !sb) {
    return <p className="text-sm text-ink-soft">Neither run has stability figures: both were analysed by an older engine. Re-analyse them to compare jitter and phase noise.</p>;
  }
  const cellOf = (s: StabilityResult | null, row: Row): Cell => (s ? row.cell(s) : { text: "not measured (older engine)" });
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[28rem] text-sm">
        <caption className="sr-only">Stability figures of runs A and B</caption>
        <thead>
          <tr className="border-b border-rule text-left text-xs text-ink-soft">
            <th scope="col" className="py-1.5 pr-3 font-medium">Figure</th>
            <th scope="col" className="py-1.5 pr-3 font-medium">{a.label}</th>
            <th scope="col" className="py-1.5 font-medium">{b.label}</th>
          </tr>
        </thead>
        <tbody>
          {rowsFor(sa, sb).map((row) => {
            const ca = cellOf(sa, row);
            const cb = cellOf(sb, row);
            return (
              <tr key={row.label} className="border-b border-rule/60 last:border-0">
                <th scope="row" className="py-1.5 pr-3 text-left font-normal text-ink-soft">{row.label}</th>
                <td className="num py-1.5 pr-3 font-mono text-[13px]" title={ca.title}>{ca.text}</td>
                <td className="num py-1.5 font-mono text-[13px]" title={cb.title}>{cb.text}</td>
              </tr>
            );
          })}
        </tbody>
      </table>
      <p className="mt-2 text-xs text-ink-faint">“≤” marks a figure at the capture&apos;s noise floor: an upper bound, not a measurement.</p>
    </div>
  );
}
