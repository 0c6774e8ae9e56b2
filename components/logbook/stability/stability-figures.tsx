import type { ReactNode } from "react";
import type { StabilityResult } from "@/lib/analysis/stability/types";
import { formatDecibels, formatQuantity } from "@/lib/format/numbers";
import { MetricTile } from "../metric-tile";

/** "≤ " for a figure at its floor: an upper bound, never a measurement. */
function bound(atFloor: boolean): string {
  return atFloor ? "≤ " : "";
}

function NotMeasured() {
  return <span className="font-sans text-sm font-normal text-ink-soft">not measured</span>;
}

function noteFor(reason: string | null, atFloor: boolean, floorText: string | null): ReactNode {
  if (reason) return reason;
  return atFloor ? `At the capture's noise floor${floorText ? ` (${floorText})` : ""}: the oscillator is at least this clean.` : floorText ? `Floor ${floorText}.` : null;
}

/** A tile's detail line may be long (a band, two figures): let it wrap on a phone instead of pushing the page wide. */
function Wrap({ children }: { children: ReactNode }) {
  return <span className="whitespace-normal break-words">{children}</span>;
}

/** The jitter, period-jitter and envelope figures as headline tiles. */
export function StabilityFigures({ stability }: { stability: StabilityResult }) {
  const { jitter, periodJitter, envelope, phaseNoise } = stability;
  const firstPoint = phaseNoise.points.find((p) => !p.atFloor) ?? phaseNoise.points[0];
  return (
    <dl className="grid grid-cols-1 gap-2 sm:grid-cols-2 xl:grid-cols-4">
      <MetricTile
        label="rms phase jitter"
        value={jitter.rmsJitterS === null ? <NotMeasured /> : `${bound(jitter.atFloor)}${formatQuantity(jitter.rmsJitterS, "s", 3)}`}
        detail={
          jitter.rmsPhaseRad === null ? undefined : (
            <Wrap>{`${bound(jitter.atFloor)}${formatQuantity(jitter.rmsPhaseRad, "rad", 3)} over ${formatQuantity(jitter.bandLowHz, "Hz", 2)}–${formatQuantity(jitter.bandHighHz, "Hz", 3)}`}</Wrap>
          )
        }
        note={noteFor(jitter.reason, jitter.atFloor, jitter.floorRmsJitterS === null ? null : formatQuantity(jitter.floorRmsJitterS, "s", 3))}
      />
      <MetricTile
        label={firstPoint ? `Phase noise at ${formatQuantity(firstPoint.offsetHz, "Hz", 2, { trimZeros: true })}` : "Phase noise"}
        value={
          firstPoint ? `${bound(firstPoint.atFloor)}${formatDecibels(firstPoint.dbcPerHz, "dBc/Hz")}` : <NotMeasured />
        }
        detail={phaseNoise.floor ? <Wrap>{`floor ${formatDecibels(phaseNoise.floor.dbcPerHz, "dBc/Hz")}`}</Wrap> : undefined}
        note={phaseNoise.reason ?? (firstPoint?.atFloor ? "Every decade offset is at the floor." : null)}
      />
      <MetricTile
        label="Period jitter (rms)"
        value={
          periodJitter.rmsPeriodJitterS === null ? (
            <NotMeasured />
          ) : (
            `${bound(periodJitter.atFloor)}${formatQuantity(periodJitter.rmsPeriodJitterS, "s", 3)}`
          )
        }
        detail={
          periodJitter.rmsCycleToCycleS === null || periodJitter.rmsPeriodJitterFraction === null ? undefined : (
            <Wrap>{`cycle-to-cycle ${bound(periodJitter.atFloor)}${formatQuantity(periodJitter.rmsCycleToCycleS, "s", 3)} · ${bound(periodJitter.atFloor)}${(periodJitter.rmsPeriodJitterFraction * 1e6).toPrecision(3)} ppm of T`}</Wrap>
          )
        }
        note={periodJitter.reason ?? `${periodJitter.periods} periods${periodJitter.atFloor ? ", at the noise floor" : ""}.`}
      />
      <MetricTile
        label={envelopeLabel(envelope.kind)}
        value={envelopeValue(stability)}
        detail={envelopeDetail(stability) ? <Wrap>{envelopeDetail(stability)}</Wrap> : undefined}
        note={envelope.reason}
      />
    </dl>
  );
}

function envelopeLabel(kind: StabilityResult["envelope"]["kind"]): string {
  if (kind === "start-up") return "Start-up (to 90 %)";
  if (kind === "ring-down") return "Ring-down Q";
  return "Envelope";
}

function envelopeValue({ envelope }: StabilityResult): ReactNode {
  if (envelope.kind === "start-up") return envelope.startUpS === null ? <NotMeasured /> : formatQuantity(envelope.startUpS, "s", 3);
  if (envelope.kind === "ring-down") return envelope.q === null ? <NotMeasured /> : `${envelope.q.toPrecision(4)} ± ${(envelope.qSigma ?? 0).toPrecision(2)}`;
  return envelope.kind === "steady" ? "steady" : <NotMeasured />;
}

function envelopeDetail({ envelope }: StabilityResult): string | undefined {
  if (envelope.kind === "start-up" && envelope.growthPerS !== null) return `growth ${envelope.growthPerS.toPrecision(3)} /s`;
  if (envelope.kind === "ring-down" && envelope.decayTauS !== null) {
    return `τ ${formatQuantity(envelope.decayTauS, "s", 4)} ± ${formatQuantity(envelope.decayTauSigmaS ?? 0, "s", 2)}`;
  }
  return undefined;
}
