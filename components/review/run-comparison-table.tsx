import Link from "next/link";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import type { MetricDifference, RunComparison } from "@/lib/drift-trend/run-comparison";
import { DASH, formatDecibels, formatPercent, formatPpm, formatQuantity, formatSignedCapacitance } from "@/lib/format/numbers";

function value(unit: string, v: number | null): string {
  if (v === null) return DASH;
  if (unit === "Hz") return formatQuantity(v, "Hz", 7);
  if (unit === "ppm") return formatPpm(v);
  if (unit === "F") return formatSignedCapacitance(v);
  if (unit === "V") return formatQuantity(v, "V", 4);
  if (unit === "%") return formatPercent(v);
  return formatDecibels(v, unit);
}

function change(unit: string, v: number | null): string {
  if (v === null) return DASH;
  if (unit === "Hz") return formatQuantity(v, "Hz", 4, { signed: true });
  if (unit === "ppm") return formatPpm(v);
  if (unit === "F") return formatSignedCapacitance(v);
  if (unit === "V") return formatQuantity(v, "V", 3, { signed: true });
  // A difference of two levels (dBc or dB) is a plain dB figure; of two percentages, percentage points.
  if (unit === "%") return `${formatPercent(v, 3, { signed: true }).replace(" %", "")} pp`;
  const text = formatDecibels(v, "dB");
  return v > 0 ? `+${text}` : text;
}

const BETTER: Record<NonNullable<MetricDifference["better"]>, string> = { a: "A better", b: "B better", same: "no change" };

/** Every figure of runs A and B, the change B − A, and which side is better where a figure has one. */
export function RunComparisonTable({ comparison, a, b }: { comparison: RunComparison; a: { id: string; label: string }; b: { id: string; label: string } }) {
  const c = comparison;
  return (
    <div className="space-y-2">
      {c.frequencyChangeSignificant !== null ? (
        <p className="text-sm text-ink">
          <span aria-hidden="true">{c.frequencyChangeSignificant ? "↕ " : "= "}</span>
          {c.frequencyChangeSignificant
            ? `The frequency moved by ${formatPpm(c.frequencyChangePpm)}, more than twice the combined uncertainty (± ${formatQuantity(c.frequencyChangeUncertaintyHz, "Hz", 2)}): a real change.`
            : `The frequency change (${formatPpm(c.frequencyChangePpm)}) is within twice the combined uncertainty (± ${formatQuantity(c.frequencyChangeUncertaintyHz, "Hz", 2)}): not distinguishable from noise.`}
        </p>
      ) : null}
      <Table caption="Figures of both runs and their change">
        <thead>
          <tr>
            <Th>Figure</Th>
            <Th className="text-right">
              <Link href={`/runs/${a.id}`} className="hover:text-copper hover:underline">
                A
              </Link>
            </Th>
            <Th className="text-right">
              <Link href={`/runs/${b.id}`} className="hover:text-copper hover:underline">
                B
              </Link>
            </Th>
            <Th className="text-right">B − A</Th>
            <Th className="hidden sm:table-cell">Better</Th>
          </tr>
        </thead>
        <tbody>
          {c.rows.map((r) => (
            <Tr key={r.key}>
              <Td className="text-sm text-ink">{r.label}</Td>
              <Td numeric className="whitespace-nowrap">{value(r.unit, r.a)}</Td>
              <Td numeric className="whitespace-nowrap">{value(r.unit, r.b)}</Td>
              <Td numeric className="whitespace-nowrap font-semibold">{change(r.unit, r.change)}</Td>
              <Td className="hidden text-xs text-ink-soft sm:table-cell">
                {r.better ? (
                  <>
                    <span aria-hidden="true">{r.better === "same" ? "= " : r.better === "b" ? "▶ " : "◀ "}</span>
                    {BETTER[r.better]}
                  </>
                ) : (
                  DASH
                )}
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>
      <p className="text-xs text-ink-faint">
        A: {a.label} · B: {b.label}
      </p>
    </div>
  );
}
