import { VerdictBadge } from "@/components/ui/verdict-badge";
import { formatQuantity } from "@/lib/format/numbers";
import type { RepeatSetReport } from "@/lib/sensitivity/types";
import { conditionText, fractionText, repeatVerdictText, spacingText } from "./sensitivity-text";

export interface RunToRunTableProps {
  sets: RepeatSetReport[];
  testLevel: number;
  /** Show which build state each set belongs to (when there are several). */
  showState: boolean;
}

/** Repeated runs under one condition: their Allan deviation against what their uncertainties explain, and the χ² verdict. */
export function RunToRunTable({ sets, testLevel, showState }: RunToRunTableProps) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full min-w-[34rem] text-left text-sm">
        <caption className="sr-only">Run-to-run stability of repeated runs</caption>
        <thead className="text-xs text-ink-soft">
          <tr className="border-b border-rule">
            {showState ? <th scope="col" className="py-1.5 pr-3 font-medium">State</th> : null}
            <th scope="col" className="py-1.5 pr-3 font-medium">Condition</th>
            <th scope="col" className="py-1.5 pr-3 text-right font-medium">Runs</th>
            <th scope="col" className="py-1.5 pr-3 text-right font-medium">Mean</th>
            <th scope="col" className="py-1.5 pr-3 text-right font-medium">
              σ<sub>y</sub> (τ)
            </th>
            <th scope="col" className="py-1.5 pr-3 text-right font-medium">From 1σ alone</th>
            <th scope="col" className="py-1.5 font-medium">Verdict</th>
          </tr>
        </thead>
        <tbody>
          {sets.map((s) => (
            <tr key={s.runIds.join(",")} className="border-b border-rule/60 align-top">
              {showState ? <td className="num py-1.5 pr-3 font-mono text-xs">{s.groupIndex + 1}</td> : null}
              <td className="py-1.5 pr-3">{conditionText(s)}</td>
              <td className="num py-1.5 pr-3 text-right font-mono">{s.runs}</td>
              <td className="num whitespace-nowrap py-1.5 pr-3 text-right font-mono">{formatQuantity(s.meanHz, "Hz", 8)}</td>
              <td className="num whitespace-nowrap py-1.5 pr-3 text-right font-mono">
                {fractionText(s.allanDeviation)}
                {s.tauS !== null ? <span className="block text-xs text-ink-soft">τ ≈ {spacingText(s.tauS)}</span> : null}
              </td>
              <td className="num whitespace-nowrap py-1.5 pr-3 text-right font-mono">{fractionText(s.expectedAllanDeviation)}</td>
              <td className="py-1.5 text-xs text-ink-soft">
                {s.reason ? (
                  <VerdictBadge verdict="none" label="Not tested" />
                ) : s.flagged ? (
                  <VerdictBadge verdict="flagged" label="Unexplained scatter" />
                ) : (
                  <VerdictBadge verdict="pass" label="Within 1σ" />
                )}
                <span className="mt-0.5 block">{repeatVerdictText(s, testLevel)}</span>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
