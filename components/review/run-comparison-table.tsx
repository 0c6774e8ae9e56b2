import Link from "next/link";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { VerdictBadge } from "@/components/ui/verdict-badge";
import type { ComparableVerdict, MetricDifference, RunComparison } from "@/lib/drift-trend/run-comparison";
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
const MARK: Record<NonNullable<MetricDifference["better"]>, string> = { a: "◀ ", b: "▶ ", same: "= " };

/** The "better" cell in words: against the spec or target where there is one, else by the figure's direction. */
function betterText(r: MetricDifference): string | null {
  if (r.better === null) return null;
  if (r.basis === "spec" || r.basis === "target") {
    const inWords = r.basis === "target" ? "on target" : "in spec";
    const outWords = r.basis === "target" ? "off target" : "outside spec";
    if (r.better === "same") return r.within?.a ? `both ${inWords}` : `both ${outWords}`;
    return `${r.better.toUpperCase()} ${inWords}, ${r.better === "a" ? "B" : "A"} ${outWords.replace(" spec", "")}`;
  }
  return BETTER[r.better];
}

function verdictBetterText(better: RunComparison["verdict"]["better"]): string | null {
  if (better === null) return null;
  return better === "same" ? "same verdict" : `${better.toUpperCase()} better`;
}

function Verdict({ verdict }: { verdict: ComparableVerdict }) {
  return verdict ? <VerdictBadge verdict={verdict} label={verdict === "inconclusive" ? "Cannot judge" : undefined} /> : <span className="text-ink-faint">{DASH}</span>;
}

function Better({ text, mark }: { text: string | null; mark: keyof typeof MARK | null }) {
  if (text === null || mark === null) return <>{DASH}</>;
  return (
    <>
      <span aria-hidden="true">{MARK[mark]}</span>
      {text}
    </>
  );
}

/**
 * The verdicts and every figure of runs A and B, the change B − A, and which side is better: against the spec or the
 * target where one applies. A table from 640 px up; on a phone each figure is a small block, so B − A and the
 * judgement are never off-screen.
 */
export function RunComparisonTable({ comparison, a, b }: { comparison: RunComparison; a: { id: string; label: string }; b: { id: string; label: string } }) {
  const c = comparison;
  return (
    <div className="space-y-2">
      {c.frequencyChangeSignificant !== null ? (
        <p className="text-sm text-ink">
          <span aria-hidden="true">{c.frequencyChangeSignificant ? "↕ " : "= "}</span>
          {c.frequencyChangeSignificant
            ? `The frequency moved by ${formatPpm(c.frequencyChangePpm)}, more than twice the combined uncertainty (± ${formatQuantity(c.frequencyChangeUncertaintyHz, "Hz", 2)}): a real change.`
            : `The frequency change (${formatPpm(c.frequencyChangePpm)}) is within twice the combined uncertainty (± ${formatQuantity(c.frequencyChangeUncertaintyHz, "Hz", 2)}): not distinguishable from noise.`}{" "}
          <span className="text-ink-soft">
            Both runs are of one build on one bench, so the scope&apos;s timebase error is common to both and cancels in the change; the
            uncertainty here is the captures&apos; own (statistical).
          </span>
        </p>
      ) : null}
      <dl className="divide-y divide-rule rounded-lg border border-rule sm:hidden" aria-label="Figures of both runs and their change">
        <div className="px-3 py-2">
          <dt className="text-sm font-medium text-ink">Verdict</dt>
          <dd className="mt-1 flex flex-wrap items-center gap-x-3 gap-y-1 text-xs">
            <span className="flex items-center gap-1">A <Verdict verdict={c.verdict.a} /></span>
            <span className="flex items-center gap-1">B <Verdict verdict={c.verdict.b} /></span>
            <span className="text-ink-soft">
              <Better text={verdictBetterText(c.verdict.better)} mark={c.verdict.better} />
            </span>
          </dd>
        </div>
        {c.rows.map((r) => (
          <div key={r.key} className="px-3 py-2">
            <dt className="text-sm font-medium text-ink">{r.label}</dt>
            <dd className="num mt-1 grid grid-cols-[auto_1fr] gap-x-3 font-mono text-[13px]">
              <span className="text-ink-faint">A</span>
              <span>{r.missing?.a ?? value(r.unit, r.a)}</span>
              <span className="text-ink-faint">B</span>
              <span>{r.missing?.b ?? value(r.unit, r.b)}</span>
              <span className="text-ink-faint">B − A</span>
              <span className="font-semibold">{change(r.unit, r.change)}</span>
            </dd>
            <dd className="mt-0.5 text-xs text-ink-soft">
              <Better text={betterText(r)} mark={r.better} />
            </dd>
          </div>
        ))}
      </dl>
      <Table caption="Figures of both runs and their change" className="hidden sm:block">
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
            <Th>Better</Th>
          </tr>
        </thead>
        <tbody>
          <Tr>
            <Td className="text-sm text-ink">Verdict</Td>
            <Td className="text-right">
              <Verdict verdict={c.verdict.a} />
            </Td>
            <Td className="text-right">
              <Verdict verdict={c.verdict.b} />
            </Td>
            <Td numeric>{DASH}</Td>
            <Td className="text-xs text-ink-soft">
              <Better text={verdictBetterText(c.verdict.better)} mark={c.verdict.better} />
            </Td>
          </Tr>
          {c.rows.map((r) => (
            <Tr key={r.key}>
              <Td className="text-sm text-ink">{r.label}</Td>
              <Td numeric className="whitespace-nowrap">{r.missing?.a ?? value(r.unit, r.a)}</Td>
              <Td numeric className="whitespace-nowrap">{r.missing?.b ?? value(r.unit, r.b)}</Td>
              <Td numeric className="whitespace-nowrap font-semibold">{change(r.unit, r.change)}</Td>
              <Td className="text-xs text-ink-soft">
                <Better text={betterText(r)} mark={r.better} />
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
