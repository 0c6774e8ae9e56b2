import { formatEngineering } from "@/lib/oscillator/units";
import type { BuildSlopeMeasurement, CheckOutcome, DesignSpec, SpecCheck, SpecMeasurements } from "./types";

// The stability rules: per capture (rms jitter, phase noise at one offset, start-up time) from result.stability,
// and per build (pushing, temperature coefficient) from the across-runs figures. A figure that was not measured is
// "cannot judge", never a pass; a figure at the capture's floor passes only when the floor itself is inside the limit.

function isSet(value: number | null | undefined): value is number {
  return typeof value === "number" && Number.isFinite(value);
}

function cannotJudge(check: Omit<SpecCheck, "passed" | "outcome">): SpecCheck {
  return { ...check, passed: false, outcome: "cannot-judge" };
}

function judged(check: Omit<SpecCheck, "outcome">): SpecCheck {
  const outcome: CheckOutcome = check.passed ? "pass" : "fail";
  return { ...check, outcome };
}

const seconds = (value: number) => formatEngineering(value, "s", 3, { trimZeros: true });
const hertz = (value: number) => formatEngineering(value, "Hz", 3, { trimZeros: true });
const db = (value: number) => `${value.toFixed(1).replace(/^-/, "−")} dBc/Hz`;

/** A measured time against its maximum, with the margin in the message. */
function maximumSeconds(base: { rule: string; limit: number; unit: string }, value: number, limit: number, what: string): SpecCheck {
  const margin = limit - value;
  const passed = margin >= 0;
  const by = passed ? `inside by ${seconds(margin)}` : `outside by ${seconds(-margin)}`;
  return judged({ ...base, passed, measured: value, margin, message: `${what} ${seconds(value)} against a maximum of ${seconds(limit)}: ${by}.` });
}

const NO_STABILITY = "this capture carries no stability figures (it was analysed before they existed)";
const REANALYSE = "re-analyse the run to compute its stability figures";

/** Largest rms jitter, s. At the floor the figure is an upper bound: a pass when it is inside the limit, else cannot judge. */
export function jitterCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.maxRmsJitterS)) return null;
  const limit = spec.maxRmsJitterS;
  const base = { rule: "rms-jitter", limit, unit: "s" };
  const jitter = m.stability?.jitter;
  if (!jitter || !isSet(jitter.rmsJitterS)) {
    return cannotJudge({
      ...base,
      measured: null,
      margin: null,
      advice: jitter ? "a longer or cleaner capture" : REANALYSE,
      message: `Cannot judge rms jitter against ${seconds(limit)}: ${jitter?.reason ?? NO_STABILITY}.`,
    });
  }
  const value = jitter.rmsJitterS;
  const band = isSet(jitter.bandLowHz) && isSet(jitter.bandHighHz) ? ` over ${hertz(jitter.bandLowHz)}–${hertz(jitter.bandHighHz)}` : "";
  if (jitter.atFloor) {
    if (value <= limit) {
      return judged({
        ...base,
        passed: true,
        measured: value,
        margin: limit - value,
        message: `rms jitter${band} is at the capture's floor, at most ${seconds(value)}, against a maximum of ${seconds(limit)}: inside by at least ${seconds(limit - value)}.`,
      });
    }
    return cannotJudge({
      ...base,
      measured: null,
      margin: null,
      advice: "a capture with less noise or finer quantization lowers the floor",
      message: `Cannot judge rms jitter against ${seconds(limit)}: it is at the capture's floor of ${seconds(value)}, which is above the limit.`,
    });
  }
  return maximumSeconds(base, value, limit, `rms jitter${band}`);
}

/** Offsets within this fraction of each other are the same offset (a decade grid written 1e4 or 10 kHz). */
const OFFSET_MATCH = 0.005;

/** Phase noise at the chosen offset, dBc/Hz, from a measured point at that offset only (never interpolated). */
export function phaseNoiseCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.maxPhaseNoiseDbcPerHz) || !isSet(spec.phaseNoiseOffsetHz)) return null;
  const limit = spec.maxPhaseNoiseDbcPerHz;
  const offset = spec.phaseNoiseOffsetHz;
  const at = hertz(offset);
  const base = { rule: "phase-noise", limit, unit: "dBc/Hz" };
  const noise = m.stability?.phaseNoise;
  const point = noise?.points.find((p) => Math.abs(p.offsetHz - offset) <= OFFSET_MATCH * offset);
  if (!point) {
    const offered = noise?.points.length ? ` (its estimates are at ${noise.points.map((p) => hertz(p.offsetHz)).join(", ")})` : "";
    return cannotJudge({
      ...base,
      measured: null,
      margin: null,
      advice: noise ? "a record long enough for this offset (at least a few periods of it) and a sample rate above twice it" : REANALYSE,
      message: `Cannot judge phase noise at ${at} against ${db(limit)}: ${noise ? `this capture gives no estimate at ${at}${offered}${noise.reason ? `; ${noise.reason}` : ""}` : NO_STABILITY}.`,
    });
  }
  if (point.atFloor) {
    if (point.floorDbcPerHz <= limit) {
      return judged({
        ...base,
        passed: true,
        measured: point.floorDbcPerHz,
        margin: limit - point.floorDbcPerHz,
        message: `Phase noise at ${at} is at the capture's floor, ≤ ${db(point.floorDbcPerHz)}, against a maximum of ${db(limit)}: inside by at least ${(limit - point.floorDbcPerHz).toFixed(1)} dB.`,
      });
    }
    return cannotJudge({
      ...base,
      measured: null,
      margin: null,
      advice: "a capture with less additive noise or finer quantization lowers the floor",
      message: `Cannot judge phase noise at ${at} against ${db(limit)}: the estimate is at the capture's floor of ${db(point.floorDbcPerHz)}, which is above the limit.`,
    });
  }
  const margin = limit - point.dbcPerHz;
  const passed = margin >= 0;
  return judged({
    ...base,
    passed,
    measured: point.dbcPerHz,
    margin,
    message: `Phase noise at ${at} ${db(point.dbcPerHz)} against a maximum of ${db(limit)}: ${passed ? "inside" : "outside"} by ${Math.abs(margin).toFixed(1)} dB.`,
  });
}

/** Longest start-up time, s: judged only on a record that shows a start-up. */
export function startUpCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.maxStartUpS)) return null;
  const limit = spec.maxStartUpS;
  const base = { rule: "start-up", limit, unit: "s" };
  const envelope = m.stability?.envelope;
  if (!envelope || envelope.kind !== "start-up" || !isSet(envelope.startUpS)) {
    const why = !envelope
      ? NO_STABILITY
      : envelope.kind === "steady"
        ? "the record is steady from its first sample, so it holds no start-up to time"
        : envelope.kind === "ring-down"
          ? "the record shows a decaying oscillation, not a start-up"
          : (envelope.reason ?? "the start-up could not be timed on this record");
    return cannotJudge({
      ...base,
      measured: null,
      margin: null,
      advice: envelope ? "capture from power-on, triggered on the supply, with the settled amplitude inside the record" : REANALYSE,
      message: `Cannot judge the start-up time against ${seconds(limit)}: ${why}.`,
    });
  }
  return maximumSeconds(base, envelope.startUpS, limit, "Start-up to 90 % of the settled amplitude took");
}

/**
 * |slope| against a limit, for pushing (ppm/V) and the temperature coefficient (ppm/K). A margin smaller than the
 * slope's 1σ decides nothing (the same reading as the frequency rule's timebase).
 */
function buildSlopeCheck(rule: "pushing" | "tempco", limit: number, slope: BuildSlopeMeasurement | undefined, unit: "ppm/V" | "ppm/K"): SpecCheck {
  const name = rule === "pushing" ? "pushing" : "the temperature coefficient";
  const base = { rule, limit, unit };
  const advice =
    rule === "pushing"
      ? "upload at least 3 captures of this build state at different supply voltages (entered with each upload)"
      : "upload at least 3 captures of this build state at different temperatures (entered with each upload)";
  if (!slope) {
    return cannotJudge({ ...base, measured: null, margin: null, advice, message: `Cannot judge ${name} against ±${limit} ${unit}: the build's figures across runs were not computed for this run.` });
  }
  if (!slope.measured) {
    return cannotJudge({ ...base, measured: null, margin: null, advice, message: `Cannot judge ${name} against ±${limit} ${unit}: not measured (${slope.reason}).` });
  }
  const margin = limit - Math.abs(slope.ppm);
  // The value to the 1σ's second significant figure, as the Sensitivity card writes it.
  const decimals = slope.ppmSigma > 0 ? Math.min(6, Math.max(0, 1 - Math.floor(Math.log10(slope.ppmSigma)))) : 1;
  const text = `${slope.ppm.toFixed(decimals).replace(/^-/, "−")} ± ${slope.ppmSigma.toFixed(decimals)} ${unit}`;
  if (Math.abs(margin) < slope.ppmSigma) {
    return cannotJudge({
      ...base,
      measured: slope.ppm,
      margin: null,
      advice: "more runs, or a wider spread of the variable, narrow the 1σ",
      message: `Cannot judge ${name}: the build measures ${text} over ${slope.runs} runs against ±${limit} ${unit}, ${margin >= 0 ? "inside" : "outside"} by less than its 1σ.`,
    });
  }
  const passed = margin >= 0;
  return judged({
    ...base,
    passed,
    measured: slope.ppm,
    margin,
    message: `The build's ${rule === "pushing" ? "pushing" : "temperature coefficient"} is ${text} over ${slope.runs} runs against ±${limit} ${unit}: ${passed ? "inside" : "outside"} by ${Math.abs(margin).toFixed(1)} ${unit}.`,
  });
}

/** The build-level rules, from the build's across-runs figures with the run included. */
export function buildSensitivityChecks(spec: DesignSpec, m: SpecMeasurements): SpecCheck[] {
  const checks: SpecCheck[] = [];
  if (isSet(spec.maxPushingPpmPerV)) checks.push(buildSlopeCheck("pushing", spec.maxPushingPpmPerV, m.buildSensitivity?.pushing, "ppm/V"));
  if (isSet(spec.maxTempcoPpmPerK)) checks.push(buildSlopeCheck("tempco", spec.maxTempcoPpmPerK, m.buildSensitivity?.tempco, "ppm/K"));
  return checks;
}

/** True when the spec sets a rule that needs the build's across-runs figures. */
export function needsBuildSensitivity(spec: DesignSpec): boolean {
  return isSet(spec.maxPushingPpmPerV) || isSet(spec.maxTempcoPpmPerK);
}

/** True when the spec sets any stability rule. */
export function hasStabilityLimit(spec: DesignSpec): boolean {
  return isSet(spec.maxRmsJitterS) || (isSet(spec.maxPhaseNoiseDbcPerHz) && isSet(spec.phaseNoiseOffsetHz)) || isSet(spec.maxStartUpS) || needsBuildSensitivity(spec);
}
