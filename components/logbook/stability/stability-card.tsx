"use client";

import { AllanChart } from "@/components/charts/allan-chart";
import { EnvelopeChart } from "@/components/charts/envelope-chart";
import { PhaseNoiseChart } from "@/components/charts/phase-noise-chart";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { StabilityReading } from "./read-stability";
import { StabilityFigures } from "./stability-figures";

export interface StabilityCardProps {
  /** The run's stability, read once by the page from the stored result (see readStability). */
  reading: StabilityReading;
}

function Empty({ children }: { children: string }) {
  return <p className="rounded-md border border-dashed border-rule bg-paper px-3 py-6 text-center text-sm text-ink-soft">{children}</p>;
}

/**
 * The run's stability: phase noise with its floor, jitter, the Allan deviation within the record, and the
 * start-up or ring-down with its envelope. Every figure at its floor reads "≤"; a missing one says why.
 */
export function StabilityCard({ reading }: StabilityCardProps) {
  return (
    <Card aria-labelledby="stability-title" data-testid="stability-card">
      <CardHeader
        title={<span id="stability-title">Stability</span>}
        description="Phase noise and jitter from the record's phase against the fitted tone (IEEE Std 2414 terms), Allan deviation within the record (IEEE Std 1139), start-up or ring-down."
      />
      <CardBody className="space-y-4">
        {reading.status === "not-measured" ? (
          <Empty>{reading.reason}</Empty>
        ) : (
          <>
            <StabilityFigures stability={reading.stability} />
            <div className="grid gap-5 lg:grid-cols-2">
              <figure className="min-w-0">
                <figcaption className="mb-1 text-xs font-medium text-ink-soft">Phase noise 𝓛(f), dBc/Hz</figcaption>
                {reading.stability.phaseNoise.curve ? (
                  <PhaseNoiseChart {...reading.stability.phaseNoise.curve} />
                ) : (
                  <Empty>{`Not measured: ${reading.stability.phaseNoise.reason ?? "no offset band in this record"}`}</Empty>
                )}
              </figure>
              <figure className="min-w-0">
                <figcaption className="mb-1 text-xs font-medium text-ink-soft">Allan deviation within the record</figcaption>
                {reading.stability.allan.points.length > 0 ? (
                  <AllanChart points={reading.stability.allan.points} />
                ) : (
                  <Empty>{`Not measured: ${reading.stability.allan.reason ?? "no τ in this record"}`}</Empty>
                )}
              </figure>
            </div>
            {reading.stability.envelope.curve && reading.stability.envelope.kind !== "steady" ? (
              <figure className="min-w-0">
                <figcaption className="mb-1 text-xs font-medium text-ink-soft">Envelope of the fundamental ({reading.stability.envelope.kind})</figcaption>
                <EnvelopeChart
                  timeS={reading.stability.envelope.curve.timeS}
                  amplitudeVpk={reading.stability.envelope.curve.amplitudeVpk}
                  markVpk={reading.stability.envelope.kind === "start-up" && reading.stability.envelope.settledVpk !== null ? 0.9 * reading.stability.envelope.settledVpk : null}
                  markLabel="90 % of the settled amplitude"
                />
              </figure>
            ) : null}
            <p className="text-xs text-ink-faint">{reading.stability.allan.confidence}.</p>
          </>
        )}
      </CardBody>
    </Card>
  );
}
