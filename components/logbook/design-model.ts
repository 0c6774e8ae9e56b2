import type { DesignRevision } from "@/db/queries/designs";
import type { OscillatorDesign, Topology } from "@/lib/oscillator/design";
import { predictOscillator } from "@/lib/oscillator/topologies";
import type { DesignSpec } from "@/lib/spec/types";
import { formatDecibels, formatQuantity } from "@/lib/format/numbers";

/** The oscillator model of a stored revision. */
export function designOfRevision(topology: Topology, revision: Pick<DesignRevision, "parts" | "extraCapacitanceF" | "windings">): OscillatorDesign {
  return {
    topology,
    parts: revision.parts,
    ...(revision.extraCapacitanceF ? { extraCapacitanceF: revision.extraCapacitanceF } : {}),
    ...(revision.windings ? { windings: revision.windings } : {}),
  };
}

/** The predicted f0 in Hz, or null when the model refuses the values (shown as "—", not as an error page). */
export function predictedHzOf(design: OscillatorDesign): number | null {
  try {
    return predictOscillator(design).predictedHz;
  } catch {
    return null;
  }
}

/** The spec as short phrases: "412.3 kHz ± 0.5 %", "THD ≤ 2 %", "harmonics ≤ −40 dBc", … */
export function specPhrases(spec: DesignSpec | null | undefined): string[] {
  if (!spec) return [];
  const out: string[] = [];
  if (typeof spec.targetHz === "number") {
    const tol =
      typeof spec.toleranceValue === "number" ? ` ± ${spec.toleranceValue} ${spec.toleranceUnit === "ppm" ? "ppm" : "%"}` : "";
    out.push(`${formatQuantity(spec.targetHz, "Hz", 6, { trimZeros: true })}${tol}`);
  }
  if (typeof spec.maxThdPercent === "number") out.push(`THD ≤ ${spec.maxThdPercent} %`);
  if (typeof spec.maxHarmonicDbc === "number") out.push(`each harmonic ≤ ${formatDecibels(spec.maxHarmonicDbc, "dBc")}`);
  if (typeof spec.minFundamentalVpk === "number") out.push(`amplitude ≥ ${formatQuantity(spec.minFundamentalVpk, "V", 3, { trimZeros: true })} peak`);
  if (typeof spec.maxDriftPpm === "number") out.push(`in-record drift ≤ ${spec.maxDriftPpm} ppm`);
  if (typeof spec.maxRmsJitterS === "number") out.push(`rms jitter ≤ ${formatQuantity(spec.maxRmsJitterS, "s", 3, { trimZeros: true })}`);
  if (typeof spec.maxPhaseNoiseDbcPerHz === "number" && typeof spec.phaseNoiseOffsetHz === "number") {
    out.push(`phase noise ≤ ${formatDecibels(spec.maxPhaseNoiseDbcPerHz, "dBc/Hz")} at ${formatQuantity(spec.phaseNoiseOffsetHz, "Hz", 3, { trimZeros: true })}`);
  }
  if (typeof spec.maxStartUpS === "number") out.push(`start-up ≤ ${formatQuantity(spec.maxStartUpS, "s", 3, { trimZeros: true })}`);
  if (typeof spec.maxPushingPpmPerV === "number") out.push(`|pushing| ≤ ${spec.maxPushingPpmPerV} ppm/V`);
  if (typeof spec.maxTempcoPpmPerK === "number") out.push(`|tempco| ≤ ${spec.maxTempcoPpmPerK} ppm/K`);
  return out;
}

export const TOPOLOGY_NAMES: Record<Topology, string> = {
  tank: "Plain tank",
  colpitts: "Colpitts",
  hartley: "Hartley",
  clapp: "Clapp",
};
