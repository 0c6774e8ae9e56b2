import { MetricTile } from "@/components/logbook/metric-tile";
import type { StateGroupReport } from "@/lib/sensitivity/types";
import { absoluteSlopeText, ppmSlopeText, predictedTempcoText, sigmaBasisText, valueWithSigma } from "./sensitivity-text";

function NotMeasured() {
  return <span className="font-sans text-sm font-normal text-ink-soft">Not measured</span>;
}

/** The headline figures of one build state: pushing, amplitude pushing, temperature coefficient against the parts. */
export function SensitivityFigures({ group }: { group: StateGroupReport }) {
  const { pushing, amplitudePushing, tempco, predictedTempco } = group;
  return (
    <dl className="grid gap-2 sm:grid-cols-3">
      <MetricTile
        label="Pushing (frequency against supply)"
        value={ppmSlopeText(pushing, "ppm/V") ?? <NotMeasured />}
        detail={absoluteSlopeText(pushing, "Hz/V") ?? undefined}
        note={pushing.measured ? sigmaBasisText(pushing) : pushing.reason}
      />
      <MetricTile
        label="Amplitude against supply"
        value={amplitudePushing.measured ? valueWithSigma(amplitudePushing.slope, amplitudePushing.slopeSigma, "V/V") : <NotMeasured />}
        note={amplitudePushing.measured ? sigmaBasisText(amplitudePushing) : amplitudePushing.reason}
      />
      <MetricTile
        label="Temperature coefficient"
        value={ppmSlopeText(tempco, "ppm/K") ?? <NotMeasured />}
        detail={absoluteSlopeText(tempco, "Hz/K") ?? undefined}
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
