import type { ReactNode } from "react";
import type { StateGroupReport } from "@/lib/sensitivity/types";
import { absoluteSlopeText, ppmSlopeText, predictedTempcoText, sigmaBasisText, valueWithSigma } from "./sensitivity-text";

/** One figure: label, value (which may wrap at its ±, unlike a run tile: three sit side by side in a narrow column). */
function FigureTile({ label, value, detail, note }: { label: string; value: string | null; detail?: string | null; note: ReactNode }) {
  return (
    <div className="min-w-0 rounded-lg border border-rule bg-paper-raised px-3 py-2.5">
      <dt className="text-xs font-medium text-ink-soft">{label}</dt>
      <dd className="mt-0.5">
        {value ? (
          <span className="num block font-mono text-base font-semibold leading-tight text-ink [overflow-wrap:anywhere]">{value}</span>
        ) : (
          <span className="block text-sm font-medium text-ink-soft">Not measured</span>
        )}
        {detail ? <span className="num block font-mono text-xs text-ink-soft">{detail}</span> : null}
        <span className="mt-1 block text-xs leading-snug text-ink-faint">{note}</span>
      </dd>
    </div>
  );
}

/** The headline figures of one build state: pushing, amplitude against supply, temperature coefficient against the parts. */
export function SensitivityFigures({ group }: { group: StateGroupReport }) {
  const { pushing, amplitudePushing, tempco, predictedTempco } = group;
  return (
    <dl className="grid gap-2 md:grid-cols-3">
      <FigureTile
        label="Pushing (frequency against supply)"
        value={ppmSlopeText(pushing, "ppm/V")}
        detail={absoluteSlopeText(pushing, "Hz/V")}
        note={pushing.measured ? sigmaBasisText(pushing) : pushing.reason}
      />
      <FigureTile
        label="Amplitude against supply"
        // mV per volt reads better than 0.06 V/V with six decimals.
        value={amplitudePushing.measured ? valueWithSigma(amplitudePushing.slope * 1000, amplitudePushing.slopeSigma * 1000, "mV/V") : null}
        note={amplitudePushing.measured ? sigmaBasisText(amplitudePushing) : amplitudePushing.reason}
      />
      <FigureTile
        label="Temperature coefficient"
        value={ppmSlopeText(tempco, "ppm/K")}
        detail={absoluteSlopeText(tempco, "Hz/K")}
        note={
          <>
            {tempco.measured ? sigmaBasisText(tempco) : tempco.reason}
            <span className="mt-1 block text-ink-soft">Against the design: {predictedTempcoText(predictedTempco)}.</span>
          </>
        }
      />
    </dl>
  );
}
