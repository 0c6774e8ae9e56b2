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

function SetVerdict({ set, testLevel }: { set: RepeatSetReport; testLevel: number }) {
  return (
    <>
        {set.reason ? (
          <VerdictBadge verdict="none" label="Not tested" />
        ) : set.flagged ? (
          <VerdictBadge verdict="flagged" label="Unexplained scatter" />
        ) : (
          <VerdictBadge verdict="pass" label="Within 1σ" />
        )}
        <span className="mt-0.5 block">{repeatVerdictText(set, testLevel)}</span>
    </>
  );
}

/**
 * Repeated runs under one condition: their Allan deviation against what their uncertainties explain, and the χ²
 * verdict. A table from 640 px up; a list on a phone, where seven columns would not fit.
 */
export function RunToRunTable({ sets, testLevel, showState }: RunToRunTableProps) {
  return (
    <>
      <ul className="space-y-2 sm:hidden" aria-label="Run-to-run stability of repeated runs">
        {sets.map((s) => (
          <li key={s.runIds.join(",")} className="rounded-md border border-rule px-3 py-2 text-sm">
            <p className="font-medium text-ink">
              {showState ? `State ${s.groupIndex + 1} · ` : ""}
              {conditionText(s)} · {s.runs} runs
            </p>
            <p className="num font-mono text-xs text-ink-soft">
              mean {formatQuantity(s.meanHz, "Hz", 8)} · σ<sub>y</sub> {fractionText(s.allanDeviation)}
              {s.tauS !== null ? ` at τ ≈ ${spacingText(s.tauS)}` : ""} · from 1σ alone {fractionText(s.expectedAllanDeviation)}
            </p>
            <div className="mt-1 text-xs text-ink-soft">
              <SetVerdict set={s} testLevel={testLevel} />
            </div>
          </li>
        ))}
      </ul>
      <div className="hidden overflow-x-auto sm:block">
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
                  <SetVerdict set={s} testLevel={testLevel} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </>
  );
}
