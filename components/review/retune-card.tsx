"use client";

import Link from "next/link";
import { useActionState, type ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { FormMessage } from "@/components/ui/field";
import type { FormState } from "@/lib/auth/action-state";
import { formatDateTime } from "@/lib/format/dates";
import { formatPartValue, formatPercent, formatQuantity, formatRange, formatSignedCapacitance } from "@/lib/format/numbers";
import type { RetuneSuggestion } from "@/lib/oscillator/retune";
import { cn } from "@/lib/utils";

/** The suggestion without the full design object (the card does not need it). */
export type RetuneView = Omit<RetuneSuggestion, "design">;

export interface RetuneCardProps {
  suggestion: RetuneView | null;
  /** The run it starts from. */
  run: { id: string; originalFilename: string; createdAt: Date | string; measuredHz: number | null } | null;
  /** Why there is no suggestion when the model refused (shown instead of the card body). */
  error?: string | null;
  /** planRetuneTweakAction bound to the build id; absent for roles that may not log tweaks. */
  plan?: (prev: FormState, formData: FormData) => Promise<FormState>;
  /** Links to the same suggestion from another E-series. */
  seriesLinks?: { series: string; href: string; current: boolean }[];
  /** The run's trust warnings, in the engine's words; the card says the suggestion rests on them. */
  trustWarnings?: string[];
  /** How the card aims (the person's remembered choice) and the action that changes it (field `aim`). */
  aim?: {
    value: "measured" | "lab";
    constructionName: string;
    fallbackReason: string | null;
    choose: (prev: FormState, formData: FormData) => Promise<FormState>;
  };
}

/** The choice of calibration: this build's own run, or the lab's figure for its construction (remembered per person). */
function AimChoice({ aim }: { aim: NonNullable<RetuneCardProps["aim"]> }) {
  const [state, formAction, pending] = useActionState(aim.choose, {} as FormState);
  return (
    <form action={formAction} className="space-y-1.5">
      <fieldset className="flex flex-wrap items-center gap-x-4 gap-y-1 text-xs text-ink">
        <legend className="mb-1 text-xs font-medium text-ink-soft">Aim for the target</legend>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" name="aim" value="measured" defaultChecked={aim.value === "measured"} />
          as this build measured
        </label>
        <label className="inline-flex items-center gap-1.5">
          <input type="radio" name="aim" value="lab" defaultChecked={aim.value === "lab"} />
          as {aim.constructionName.toLowerCase().startsWith("pcb") ? aim.constructionName : `a ${aim.constructionName.toLowerCase()}`} builds here (the lab&apos;s figure)
        </label>
        <Button type="submit" size="sm" variant="secondary" disabled={pending}>
          {pending ? "Saving…" : "Aim"}
        </Button>
      </fieldset>
      {aim.fallbackReason ? <p className="text-xs text-ink-soft">{aim.fallbackReason}</p> : null}
      {state.message && !state.ok ? <FormMessage message={state.message} /> : null}
    </form>
  );
}

const ratio = (value: number | null): string => (value === null ? "—" : String(Number(value.toPrecision(3))));

function Warning({ children }: { children: ReactNode }) {
  return (
    <p className="flex gap-2 rounded-md border border-verdict-warn/40 bg-verdict-warnBg px-3 py-2 text-sm text-ink">
      <span aria-hidden="true" className="font-semibold text-verdict-warn">
        !
      </span>
      <span>{children}</span>
    </p>
  );
}

function inside(valueHz: number, band: { minHz: number; maxHz: number }): boolean {
  return valueHz >= band.minHz && valueHz <= band.maxHz;
}

/**
 * The next tweak: from the latest analysed run, the single standard-value part change that lands nearest the
 * target (taking the capacitance the measurement implies as real), its predicted frequency and bands, and one
 * button that logs it as a planned tweak.
 */
export function RetuneCard({ suggestion: s, run, error, plan, seriesLinks = [], trustWarnings = [], aim }: RetuneCardProps) {
  const [state, formAction, pending] = useActionState(plan ?? (async (prev: FormState) => prev), {} as FormState);
  if (error) {
    return <p className="text-sm text-verdict-fail">No retune suggestion: {error}</p>;
  }
  if (!s || !run) {
    return (
      <p className="text-sm text-ink-soft">
        A suggestion needs an analysed run with a measured frequency and a target frequency in the design&apos;s spec. Upload a capture, or add a
        target to the design.
      </p>
    );
  }
  const from = formatPartValue(s.fromSi, s.unit);
  const to = formatPartValue(s.toSi, s.unit);
  const targetInWorst = inside(s.targetHz, s.worstCase);
  return (
    <div className="space-y-3">
      <p className="text-xs text-ink-soft">
        From{" "}
        <Link href={`/runs/${run.id}`} className="underline underline-offset-2 hover:text-copper">
          {run.originalFilename}
        </Link>{" "}
        ({formatDateTime(run.createdAt)}, measured <span className="num font-mono">{formatQuantity(run.measuredHz, "Hz", 6)}</span>),{" "}
        {aim?.value === "lab" && !aim.fallbackReason ? (
          <>
            taking the <span className="num font-mono">{formatSignedCapacitance(s.calibrationCapacitanceF)}</span> that {aim.constructionName} builds add in
            this lab as real.
          </>
        ) : (
          <>
            taking its implied <span className="num font-mono">{formatSignedCapacitance(s.calibrationCapacitanceF)}</span> as real.
          </>
        )}
      </p>
      {aim ? <AimChoice aim={aim} /> : null}
      {trustWarnings.length > 0 ? (
        <Warning>
          <strong className="font-semibold">This run carries trust warnings</strong>, so the suggestion rests on a measurement that may be off:{" "}
          {trustWarnings.join(" ")} Check the capture (or log a clean one) before fitting a part.
        </Warning>
      ) : null}
      {s.onTarget ? (
        <p className="text-sm font-medium text-ink">
          <span aria-hidden="true" className="text-verdict-pass">
            ✓{" "}
          </span>
          On target, no tweak needed: <span className="num font-mono">{formatQuantity(s.currentHz, "Hz", 6)}</span> is within the spec&apos;s tolerance of
          the <span className="num font-mono">{formatQuantity(s.targetHz, "Hz", 6)}</span> target.
        </p>
      ) : null}
      {!s.reachable ? (
        <Warning>
          <strong className="font-semibold">The target cannot be reached with one part.</strong> The nearest reachable frequency is{" "}
          <span className="num font-mono">{formatQuantity(s.nearestReachableHz, "Hz", 6)}</span>: {s.unreachableReason}. The change below is only the
          closest Tankbook found; reaching the target is a redesign.
        </Warning>
      ) : null}
      {s.onTarget ? null : s.changed ? (
        <p className="num font-mono text-lg font-semibold text-ink">
          {s.part} {from} <span aria-hidden="true">→</span>
          <span className="sr-only">to</span> {to} <span className="font-sans text-xs font-medium text-ink-faint">{s.series}</span>
        </p>
      ) : (
        <p className="text-sm font-medium text-ink">
          <span className="num font-mono">
            {s.part} {from}
          </span>{" "}
          is already the nearest {s.series} value: no single swap gets closer to the target.
        </p>
      )}
      {s.onTarget ? null : (
        <>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            <dt className="text-ink-soft">Predicted after</dt>
            <dd className="num text-right font-mono text-[13px] text-ink">{formatQuantity(s.predictedHz, "Hz", 6)}</dd>
            <dt className="text-ink-soft">Off the target by</dt>
            <dd className="num text-right font-mono text-[13px] text-ink">
              {formatQuantity(s.errorHz, "Hz", 3, { signed: true })} · {formatPercent(s.errorPercent, 2, { signed: true })}
            </dd>
            <dt className="text-ink-soft">Worst-case band</dt>
            <dd className="num text-right font-mono text-[13px] text-ink">{formatRange(s.worstCase.minHz, s.worstCase.maxHz, "Hz", 5)}</dd>
            <dt className="text-ink-soft">Statistical band</dt>
            <dd className="num text-right font-mono text-[13px] text-ink">{formatRange(s.statistical.minHz, s.statistical.maxHz, "Hz", 5)}</dd>
            {s.feedbackFraction !== null ? (
              <>
                <dt className="text-ink-soft">Feedback fraction β</dt>
                <dd className="num text-right font-mono text-[13px] text-ink">
                  {s.changed ? (
                    <>
                      {ratio(s.feedbackFractionBefore)} <span aria-hidden="true">→</span>
                      <span className="sr-only">becomes</span> {ratio(s.feedbackFraction)}
                    </>
                  ) : (
                    ratio(s.feedbackFraction)
                  )}
                </dd>
                <dt className="text-ink-soft">Minimum gain to start</dt>
                <dd className="num text-right font-mono text-[13px] text-ink">
                  {s.changed ? (
                    <>
                      {ratio(s.minGainBefore)} × <span aria-hidden="true">→</span>
                      <span className="sr-only">becomes</span> {ratio(s.minGain)} ×
                    </>
                  ) : (
                    `${ratio(s.minGain)} ×`
                  )}
                </dd>
              </>
            ) : null}
            {s.idealSi !== null ? (
              <>
                <dt className="text-ink-soft">Exact value for the target</dt>
                <dd className="num text-right font-mono text-[13px] text-ink">{formatPartValue(s.idealSi, s.unit, 4)}</dd>
              </>
            ) : null}
          </dl>
          {s.changed && s.startupWarning ? (
            <Warning>
              <strong className="font-semibold">Less start-up margin.</strong> {s.startupWarning}.
            </Warning>
          ) : null}
          <p className="text-xs text-ink-soft">
            <span aria-hidden="true">{targetInWorst ? "✓ " : "! "}</span>
            {targetInWorst
              ? `The ${formatQuantity(s.targetHz, "Hz", 6)} target lies inside the worst-case band: parts within tolerance can land on it.`
              : `The ${formatQuantity(s.targetHz, "Hz", 6)} target lies outside the worst-case band: even perfect parts of this value miss it.`}
          </p>
        </>
      )}
      {seriesLinks.length > 1 ? (
        <nav aria-label="E-series for the suggestion" className="flex flex-wrap items-center gap-1 text-xs">
          <span className="text-ink-faint">Series:</span>
          {seriesLinks.map((l) => (
            <Link
              key={l.series}
              href={l.href}
              scroll={false}
              aria-current={l.current ? "true" : undefined}
              className={cn("rounded px-1.5 py-0.5 font-mono", l.current ? "bg-copper-light font-semibold text-copper-dark" : "text-ink-soft hover:bg-paper-sunk")}
            >
              {l.series}
            </Link>
          ))}
        </nav>
      ) : null}
      {plan && s.changed && s.reachable && !s.onTarget ? (
        <form action={formAction} className="no-print space-y-2">
          <input type="hidden" name="series" value={s.series} />
          <Button type="submit" disabled={pending}>
            {pending ? "Planning…" : "Plan this tweak"}
          </Button>
          <p className="text-xs text-ink-faint">Logs it as a planned tweak; the as-built values change only when you apply it at the bench.</p>
          <FormMessage message={state.message} tone={state.ok ? "success" : "error"} />
        </form>
      ) : null}
    </div>
  );
}
