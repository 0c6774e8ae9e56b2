import { formatEngineering } from "../../oscillator/units";
import type { StabilityResult } from "./types";

const OLDER_ENGINE = "not measured (analysed by an older engine)";

function eng(value: number, unit: string, figures = 3): string {
  return formatEngineering(value, unit, figures);
}

function dbc(value: number): string {
  return `${value.toFixed(1)} dBc/Hz`;
}

/**
 * The stability figures as labelled one-line texts, for the command's table and other plain-text
 * readers: a value at its floor reads "≤ floor", a missing one "not measured: why".
 *
 * @param stability - from the result; undefined for a result stored by an older engine
 */
export function stabilityLines(stability: StabilityResult | undefined): [string, string][] {
  if (!stability) return [["stability", OLDER_ENGINE]];
  const { jitter, phaseNoise, periodJitter, allan, envelope } = stability;
  const lines: [string, string][] = [];
  if (jitter.rmsPhaseRad === null || jitter.rmsJitterS === null) lines.push(["rms jitter", `not measured: ${jitter.reason ?? "no figure"}`]);
  else {
    const band = `over ${eng(jitter.bandLowHz ?? 0, "Hz")}–${eng(jitter.bandHighHz ?? 0, "Hz")}`;
    const mark = jitter.atFloor ? "≤ " : "";
    lines.push(["rms jitter", `${mark}${eng(jitter.rmsPhaseRad, "rad")} / ${mark}${eng(jitter.rmsJitterS, "s")} ${band}${jitter.atFloor ? " (at the capture's noise floor)" : ""}`]);
  }
  if (phaseNoise.points.length === 0) lines.push(["phase noise", `not measured: ${phaseNoise.reason ?? "no offset in the band"}`]);
  else {
    const text = phaseNoise.points.map((p) => `${eng(p.offsetHz, "Hz", 2)}: ${p.atFloor ? `≤ ${dbc(p.floorDbcPerHz)} (floor)` : dbc(p.dbcPerHz)}`).join(", ");
    lines.push(["phase noise", text]);
  }
  if (periodJitter.rmsPeriodJitterS === null || periodJitter.rmsCycleToCycleS === null || periodJitter.rmsPeriodJitterFraction === null) {
    lines.push(["period jitter", `not measured: ${periodJitter.reason ?? "no figure"}`]);
  } else {
    const mark = periodJitter.atFloor ? "≤ " : "";
    lines.push([
      "period jitter",
      `${mark}${eng(periodJitter.rmsPeriodJitterS, "s")} rms (${mark}${periodJitter.rmsPeriodJitterFraction.toExponential(2)} of the period), cycle-to-cycle ${mark}${eng(periodJitter.rmsCycleToCycleS, "s")}, ${periodJitter.periods} periods${periodJitter.atFloor ? " (at the noise floor)" : ""}`,
    ]);
  }
  if (allan.points.length === 0) lines.push(["Allan deviation", `not measured: ${allan.reason ?? "no τ"}`]);
  else {
    const first = allan.points[0];
    const last = allan.points[allan.points.length - 1];
    const value = (p: typeof first) => `${p.atFloor ? "≤" : "="} ${p.adev.toExponential(2)}`;
    const floor = allan.points.every((p) => p.atFloor) ? ", all at the noise floor" : "";
    lines.push(["Allan deviation", `σ_y(${eng(first.tauS, "s")}) ${value(first)} … σ_y(${eng(last.tauS, "s")}) ${value(last)} (${allan.points.length} τ, 68 % intervals${floor})`]);
  }
  lines.push(["envelope", envelopeText(stability)]);
  return lines;
}

function envelopeText({ envelope }: StabilityResult): string {
  if (envelope.kind === "start-up" && envelope.startUpS !== null) {
    const growth = envelope.growthPerS !== null ? `, growth ${envelope.growthPerS.toPrecision(3)} /s` : "";
    return `start-up ${eng(envelope.startUpS, "s")} to 90 % of ${eng(envelope.settledVpk ?? 0, "V")} peak${growth}`;
  }
  if (envelope.kind === "ring-down" && envelope.decayTauS !== null && envelope.q !== null) {
    return `ring-down τ = ${eng(envelope.decayTauS, "s", 4)} ± ${eng(envelope.decayTauSigmaS ?? 0, "s", 2)}, Q = ${envelope.q.toPrecision(4)} ± ${(envelope.qSigma ?? 0).toPrecision(2)}`;
  }
  return `${envelope.kind}${envelope.reason ? `: ${envelope.reason}` : ""}`;
}
