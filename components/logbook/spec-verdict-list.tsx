import { VerdictBadge } from "@/components/ui/verdict-badge";
import type { CheckOutcome, SpecCheck } from "@/lib/spec/types";
import { MINUS } from "@/lib/format/numbers";
import { ruleName } from "@/components/review/rule-name";

function outcomeOf(check: SpecCheck): CheckOutcome {
  return check.outcome ?? (check.passed ? "pass" : "fail");
}

function marginText(check: SpecCheck): string | null {
  if (check.margin === null || outcomeOf(check) === "cannot-judge") return null;
  const digits = check.unit === "ppm" ? 0 : check.unit === "V" ? 3 : check.unit === "%" ? 3 : 1;
  const size = Math.abs(check.margin).toFixed(digits);
  // A difference of two dBc levels is a plain dB figure.
  const unit = check.unit === "dBc" ? "dB" : check.unit;
  return `${check.passed ? "inside by" : "outside by"} ${size} ${unit}`.replace(/-/g, MINUS);
}

/** The spec verdict rule by rule: pass, fail or cannot judge in word and icon, how much margin, the sentence, and what would let an undecided rule be judged. */
export function SpecVerdictList({ checks }: { checks: SpecCheck[] }) {
  return (
    <ul className="divide-y divide-rule/70" aria-label="Spec checks">
      {checks.map((c) => {
        const margin = marginText(c);
        return (
          <li key={c.rule} className="flex flex-col gap-1 py-2 sm:flex-row sm:items-start sm:gap-3">
            <div className="flex shrink-0 items-center gap-2 sm:w-52">
              <VerdictBadge verdict={outcomeOf(c) === "cannot-judge" ? "inconclusive" : c.passed ? "pass" : "fail"} />
              <span className="text-sm font-medium text-ink">{ruleName(c.rule)}</span>
            </div>
            <div className="min-w-0 text-sm">
              {margin ? <span className="num mr-2 font-mono text-xs font-semibold text-ink">{margin}</span> : null}
              <span className="text-ink-soft">{c.message}</span>
              {c.advice ? <span className="mt-0.5 block text-ink">To judge it: {c.advice}.</span> : null}
            </div>
          </li>
        );
      })}
    </ul>
  );
}
