/**
 * Reads the stored result's stability object for the pages. A result without one (analysed by an engine
 * before 1.3) or with a malformed one reads as "not measured", with the reason, never as zeros.
 */
import type { StabilityResult } from "@/lib/analysis/stability/types";
import { stabilitySchema } from "@/lib/openapi/schemas/stability";

export type StabilityReading =
  | { status: "measured"; stability: StabilityResult }
  | { status: "not-measured"; reason: string };

/** @param results - the run's stored result object (unknown shape: it crosses the storage boundary here) */
export function readStability(results: unknown): StabilityReading {
  const raw = typeof results === "object" && results !== null ? (results as { stability?: unknown; engineVersion?: unknown }) : undefined;
  if (!raw || raw.stability === undefined || raw.stability === null) {
    const version = typeof raw?.engineVersion === "string" ? ` ${raw.engineVersion}` : "";
    return { status: "not-measured", reason: `Not measured (analysed by an older engine${version}); re-analyse the run to get these figures.` };
  }
  const parsed = stabilitySchema.safeParse(raw.stability);
  if (!parsed.success) return { status: "not-measured", reason: "Not measured: the stored stability figures could not be read; re-analyse the run." };
  return { status: "measured", stability: parsed.data as StabilityResult };
}

/** The fitted fundamental's envelope, DC ± amplitude per period, to draw over the waveform: a start-up or ring-down only. */
export interface WaveformEnvelope {
  timeS: number[];
  amplitudeVpk: number[];
  dcV: number;
  kind: "start-up" | "ring-down";
}

/**
 * @param reading - the run's stability as {@link readStability} read it (read once per page, shared with the card)
 * @param results - the run's stored result object, for its DC level
 */
export function waveformEnvelopeOf(reading: StabilityReading, results: unknown): WaveformEnvelope | null {
  if (reading.status !== "measured") return null;
  const { kind, curve } = reading.stability.envelope;
  if ((kind !== "start-up" && kind !== "ring-down") || !curve || curve.timeS.length < 2) return null;
  const dcV = (results as { dcV?: unknown }).dcV;
  return { timeS: curve.timeS, amplitudeVpk: curve.amplitudeVpk, dcV: typeof dcV === "number" && Number.isFinite(dcV) ? dcV : 0, kind };
}
