import { formatEngineering } from "@/lib/oscillator/units";
import { buildSensitivityChecks, hasStabilityLimit, jitterCheck, phaseNoiseCheck, startUpCheck } from "./stability-rules";
import type { CheckOutcome, DesignSpec, SpecCheck, SpecEvaluation, SpecMeasurements } from "./types";

/**
 * Trust warnings that make a run fail whatever its numbers say: a clipped or unsteady record is not
 * the oscillator's steady state, and a second mode or a sub-harmonic is a misbehaving oscillator.
 */
export const FAILING_WARNINGS: readonly string[] = ["clipping", "not-steady", "second-mode", "sub-harmonic"];
/** Warnings under which no numeric rule can be judged: there is no one tone to measure. */
export const UNJUDGEABLE_WARNINGS: readonly string[] = ["no-dominant-tone"];

function outcomeOf(passed: boolean): CheckOutcome {
  return passed ? "pass" : "fail";
}

function cannotJudge(check: Omit<SpecCheck, "passed" | "outcome">): SpecCheck {
  return { ...check, passed: false, outcome: "cannot-judge" };
}

/** What would let a rule that needs every harmonic be judged: a sample rate that keeps them apart. */
function samplingAdvice(neededSampleRateHz: number | null | undefined): string | null {
  return neededSampleRateHz ? `sample at ≥ ${formatEngineering(neededSampleRateHz, "S/s", 2)} to see every harmonic` : null;
}

function judged(check: Omit<SpecCheck, "outcome">): SpecCheck {
  return { ...check, outcome: outcomeOf(check.passed) };
}

function isSet(value: number | null | undefined): value is number {
  return typeof value === "number" && Number.isFinite(value);
}

function fixed(value: number, digits: number): string {
  return value.toFixed(digits).replace(/^-(0\.?0*)$/, "$1");
}

function signed(value: number, digits: number): string {
  const text = fixed(value, digits);
  return value > 0 && Number(text) !== 0 ? `+${text}` : text;
}

function verdictWords(passed: boolean, margin: number, digits: number, unit: string): string {
  const by = `${fixed(Math.abs(margin), digits)} ${unit}`.trimEnd();
  return passed ? (margin === 0 ? "exactly at the limit" : `inside by ${by}`) : `outside by ${by}`;
}

function frequencyCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.targetHz) || !isSet(spec.toleranceValue)) return null;
  const ppmUnit = spec.toleranceUnit === "ppm";
  const scale = ppmUnit ? 1e6 : 100;
  const unit = ppmUnit ? "ppm" : "%";
  const digits = ppmUnit ? 0 : 3;
  const deviation = ((m.frequencyHz - spec.targetHz) / spec.targetHz) * scale;
  const margin = spec.toleranceValue - Math.abs(deviation);
  const passed = margin >= 0;
  // The scope's timebase error moves every absolute frequency together; a margin smaller than it decides nothing.
  const timebase = isSet(m.timebasePpm) && m.timebasePpm > 0 ? (m.timebasePpm * scale) / 1e6 : 0;
  if (Math.abs(margin) < timebase) {
    return cannotJudge({
      rule: "frequency",
      measured: deviation,
      limit: spec.toleranceValue,
      margin: null,
      unit,
      advice: "measure against a frequency reference (a counter, or a known source captured alongside) or enter a better timebase figure",
      message:
        `Cannot judge the frequency: ${formatEngineering(m.frequencyHz, "Hz", 6)} is ${signed(deviation, digits)} ${unit} from the ` +
        `${formatEngineering(spec.targetHz, "Hz", 6)} target, ${passed ? "inside" : "outside"} the ±${spec.toleranceValue} ${unit} window by ` +
        `less than the scope's ±${m.timebasePpm} ppm timebase accuracy.`,
    });
  }
  return judged({
    rule: "frequency",
    passed,
    measured: deviation,
    limit: spec.toleranceValue,
    margin,
    unit,
    message:
      `Frequency ${formatEngineering(m.frequencyHz, "Hz", 6)} is ${signed(deviation, digits)} ${unit} from the ` +
      `${formatEngineering(spec.targetHz, "Hz", 6)} target; allowed ±${spec.toleranceValue} ${unit}: ` +
      verdictWords(passed, margin, digits, unit) + ".",
  });
}

function percentText(value: number): string {
  return value >= 0.1 ? value.toFixed(3) : value.toPrecision(2);
}

function thdCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.maxThdPercent)) return null;
  const limit = spec.maxThdPercent;
  const base = { rule: "thd", limit, unit: "%" };
  const thd = m.thd;
  if (thd?.status === "not-measurable" || (!thd && !isSet(m.thdPercent))) {
    return cannotJudge({
      ...base,
      measured: null,
      margin: null,
      advice: samplingAdvice(thd?.neededSampleRateHz),
      message: `Cannot judge THD against the ${limit} % limit: ${thd?.note ?? "THD could not be measured on this capture"}.`,
    });
  }
  const upper = thd?.upperBoundPercent ?? m.thdPercent;
  if (isSet(m.thdPercent) && m.thdPercent > limit) {
    const margin = limit - m.thdPercent;
    return judged({ ...base, passed: false, measured: m.thdPercent, margin, message: `THD ${fixed(m.thdPercent, 3)} % against a maximum of ${limit} %: ${verdictWords(false, margin, 3, "%")}.` });
  }
  if (isSet(upper) && upper <= limit) {
    const measured = isSet(m.thdPercent) ? m.thdPercent : upper;
    const margin = limit - upper;
    const what = isSet(m.thdPercent) ? `THD ${fixed(m.thdPercent, 3)} %` : `THD below its noise floor of ${percentText(thd?.floorPercent ?? upper)} %`;
    const floor = thd && thd.floorPercent > 0 && isSet(m.thdPercent) ? ` (at most ${percentText(upper)} % with the orders under the noise)` : "";
    return judged({ ...base, passed: true, measured, margin, message: `${what}${floor} against a maximum of ${limit} %: ${verdictWords(true, margin, 3, "%")}.` });
  }
  // Inside the limit on what was detected, but the noise floor leaves room above it.
  return cannotJudge({
    ...base,
    measured: isSet(m.thdPercent) ? m.thdPercent : null,
    margin: null,
    advice: "a cleaner or longer capture lowers the noise floor",
    message: `Cannot judge THD against the ${limit} % limit: ${isSet(m.thdPercent) ? `the detected orders give ${fixed(m.thdPercent, 3)} %, but` : "no harmonic stands above the noise, and"} the orders under the noise could bring it to ${isSet(upper) ? percentText(upper) : "?"} %.`,
  });
}

function harmonicChecks(spec: DesignSpec, m: SpecMeasurements, neededSampleRateHz: number | null): SpecCheck[] {
  if (!isSet(spec.maxHarmonicDbc)) return [];
  const limit = spec.maxHarmonicDbc;
  const checks: SpecCheck[] = [];
  for (const h of m.harmonics) {
    const rule = `harmonic-${h.order}`;
    const undecided = { rule, measured: null, limit, margin: null, unit: "dBc" };
    const status = h.status ?? (isSet(h.dBc) ? "measured" : undefined);
    if (status === "measured" && isSet(h.dBc)) {
      const margin = limit - h.dBc;
      const passed = margin >= 0;
      checks.push(
        judged({
          rule,
          passed,
          measured: h.dBc,
          limit,
          margin,
          unit: "dBc",
          message: `Harmonic ${h.order}${h.folded ? " (folded)" : ""} at ${fixed(h.dBc, 1)} dBc against a maximum of ${limit} dBc: ${verdictWords(passed, margin, 1, "dB")}.`,
        }),
      );
    } else if (status === "below-detection" && isSet(h.detectionLimitDbc)) {
      const detection = h.detectionLimitDbc;
      if (detection <= limit) {
        checks.push(
          judged({
            rule,
            passed: true,
            measured: null,
            limit,
            margin: limit - detection,
            unit: "dBc",
            message: `Harmonic ${h.order} is under the noise, below ${fixed(detection, 1)} dBc, against a maximum of ${limit} dBc: inside by at least ${fixed(limit - detection, 1)} dB.`,
          }),
        );
      } else {
        checks.push(
          cannotJudge({
            ...undecided,
            advice: "a cleaner or longer capture lowers the detection limit",
            message: `Cannot judge harmonic ${h.order} against ${limit} dBc: it is under the noise, but this capture can only tell levels above ${fixed(detection, 1)} dBc.`,
          }),
        );
      }
    } else if (status === "not-separable") {
      checks.push(
        cannotJudge({
          ...undecided,
          advice: samplingAdvice(neededSampleRateHz),
          message: `Cannot judge harmonic ${h.order} against ${limit} dBc: at this sample rate it lands on another component and cannot be measured.`,
        }),
      );
    }
  }
  return checks;
}

function amplitudeCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.minFundamentalVpk)) return null;
  const margin = m.fundamentalVpk - spec.minFundamentalVpk;
  const passed = margin >= 0;
  return judged({
    rule: "amplitude",
    passed,
    measured: m.fundamentalVpk,
    limit: spec.minFundamentalVpk,
    margin,
    unit: "V",
    message:
      `Fundamental ${formatEngineering(m.fundamentalVpk, "V", 4)} peak against a minimum of ` +
      `${formatEngineering(spec.minFundamentalVpk, "V", 4)}: ${passed ? (margin === 0 ? "exactly at the limit" : `above by ${formatEngineering(margin, "V", 3)}`) : `below by ${formatEngineering(-margin, "V", 3)}`}.`,
  });
}

function driftCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.maxDriftPpm)) return null;
  if (!isSet(m.inRecordDriftPpm)) {
    const flagged = m.warnings.find((w) => w.code === "in-record-drift");
    return judged({
      rule: "in-record-drift",
      passed: !flagged,
      measured: null,
      limit: spec.maxDriftPpm,
      margin: null,
      unit: "ppm",
      message: flagged
        ? `The frequency moved within the record (${flagged.message}); the ${spec.maxDriftPpm} ppm limit cannot be shown to hold.`
        : `No frequency change within the record was detectable; the limit is ${spec.maxDriftPpm} ppm.`,
    });
  }
  const size = Math.abs(m.inRecordDriftPpm);
  const margin = spec.maxDriftPpm - size;
  const passed = margin >= 0;
  return judged({
    rule: "in-record-drift",
    passed,
    measured: m.inRecordDriftPpm,
    limit: spec.maxDriftPpm,
    margin,
    unit: "ppm",
    message: `Frequency moved ${signed(m.inRecordDriftPpm, 1)} ppm within the record against a maximum of ${spec.maxDriftPpm} ppm: ${verdictWords(passed, margin, 1, "ppm")}.`,
  });
}

function warningChecks(m: SpecMeasurements): SpecCheck[] {
  const checks: SpecCheck[] = [];
  for (const w of m.warnings) {
    const base = { rule: `warning-${w.code}`, measured: null, limit: null, margin: null, unit: "" };
    if (FAILING_WARNINGS.includes(w.code)) {
      checks.push({ ...base, passed: false, outcome: "fail", message: `${w.message} A run with this warning cannot pass its spec.` });
    } else if (UNJUDGEABLE_WARNINGS.includes(w.code)) {
      checks.push(cannotJudge({ ...base, advice: "check the probe, the channel and that the oscillator runs, then capture again", message: `${w.message} No rule of the spec can be judged on it.` }));
    }
  }
  return checks;
}

/** Under a warning that leaves no one tone to measure, a numeric rule's check turns into "cannot judge". */
function withoutTone(check: SpecCheck): SpecCheck {
  if (check.rule.startsWith("warning-")) return check;
  return cannotJudge({ ...check, margin: null, message: `Cannot judge: the capture holds no dominant tone. (${check.message})` });
}

/**
 * Evaluates every rule of a spec against one analysed capture.
 *
 * Limits are inclusive (a value exactly at its limit passes). A `clipping`, `not-steady`, `second-mode` or
 * `sub-harmonic` warning fails the run whether or not the design has a spec, because such a record does not show
 * one steady oscillation. A rule the capture cannot decide (a harmonic that cannot be separated, a level under the
 * noise with a detection limit above the limit, THD whose noise floor reaches past the limit, no dominant tone) is
 * "cannot judge": never a pass, and the run's verdict is then "inconclusive" unless something failed.
 *
 * @param spec - the design's spec at the run's revision; unset limits are skipped.
 * @param measurements - the engine's numbers for the capture (frequency in Hz, THD in %, levels in dBc, amplitude in V peak).
 * Stability rules (rms jitter, phase noise at an offset, start-up time) read `measurements.stability`; the build-level
 * rules (pushing, temperature coefficient) read `measurements.buildSensitivity`. Either missing is "cannot judge".
 *
 * @returns the checks in a fixed order (frequency, THD, harmonics by order, amplitude, drift, jitter, phase noise,
 *   start-up, pushing, tempco, warnings) and the verdict
 *   from {@link verdictOf}.
 * @throws RangeError when the spec's target frequency is not above 0 Hz.
 */
export function evaluateSpec(spec: DesignSpec, measurements: SpecMeasurements): SpecEvaluation {
  if (isSet(spec.targetHz) && spec.targetHz <= 0) {
    throw new RangeError(`spec targetHz must be above 0 Hz; got ${spec.targetHz}`);
  }
  const checks: SpecCheck[] = [];
  const push = (check: SpecCheck | null) => {
    if (check) checks.push(check);
  };
  push(frequencyCheck(spec, measurements));
  push(thdCheck(spec, measurements));
  checks.push(...harmonicChecks(spec, measurements, measurements.thd?.neededSampleRateHz ?? null));
  push(amplitudeCheck(spec, measurements));
  push(driftCheck(spec, measurements));
  push(jitterCheck(spec, measurements));
  push(phaseNoiseCheck(spec, measurements));
  push(startUpCheck(spec, measurements));
  checks.push(...buildSensitivityChecks(spec, measurements));
  checks.push(...warningChecks(measurements));
  const toneMissing = measurements.warnings.some((w) => UNJUDGEABLE_WARNINGS.includes(w.code));
  const final = toneMissing ? checks.map(withoutTone) : checks;
  return { verdict: verdictOf(final), checks: final };
}

/** fail when any check failed, inconclusive when none failed but one could not be judged, pass when all passed; null with no checks. */
export function verdictOf(checks: readonly SpecCheck[]): SpecEvaluation["verdict"] {
  if (checks.length === 0) return null;
  const outcomes = checks.map((c) => c.outcome ?? outcomeOf(c.passed));
  if (outcomes.includes("fail")) return "fail";
  if (outcomes.includes("cannot-judge")) return "inconclusive";
  return "pass";
}

/** True when the spec sets at least one limit (a design without one gets no verdict unless a warning fails it). */
export function hasAnyLimit(spec: DesignSpec): boolean {
  return (
    (isSet(spec.targetHz) && isSet(spec.toleranceValue)) ||
    isSet(spec.maxThdPercent) ||
    isSet(spec.maxHarmonicDbc) ||
    isSet(spec.minFundamentalVpk) ||
    isSet(spec.maxDriftPpm) ||
    hasStabilityLimit(spec)
  );
}
