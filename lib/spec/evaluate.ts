import { formatEngineering } from "@/lib/oscillator/units";
import type { DesignSpec, SpecCheck, SpecEvaluation, SpecMeasurements } from "./types";

/** Trust warnings that make a run fail whatever its numbers say: a clipped or unsteady record is not the oscillator's steady state. */
export const FAILING_WARNINGS: readonly string[] = ["clipping", "not-steady"];

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
  return {
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
  };
}

function thdCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.maxThdPercent)) return null;
  if (!isSet(m.thdPercent)) {
    return {
      rule: "thd",
      passed: false,
      measured: null,
      limit: spec.maxThdPercent,
      margin: null,
      unit: "%",
      message: `THD could not be measured on this capture (no harmonic below Nyquist), so the ${spec.maxThdPercent} % limit cannot be shown to hold.`,
    };
  }
  const margin = spec.maxThdPercent - m.thdPercent;
  const passed = margin >= 0;
  return {
    rule: "thd",
    passed,
    measured: m.thdPercent,
    limit: spec.maxThdPercent,
    margin,
    unit: "%",
    message: `THD ${fixed(m.thdPercent, 3)} % against a maximum of ${spec.maxThdPercent} %: ${verdictWords(passed, margin, 3, "%")}.`,
  };
}

function harmonicChecks(spec: DesignSpec, m: SpecMeasurements): SpecCheck[] {
  if (!isSet(spec.maxHarmonicDbc)) return [];
  const limit = spec.maxHarmonicDbc;
  return m.harmonics
    .filter((h) => isSet(h.dBc))
    .map((h) => {
      const level = h.dBc as number;
      const margin = limit - level;
      const passed = margin >= 0;
      return {
        rule: `harmonic-${h.order}`,
        passed,
        measured: level,
        limit,
        margin,
        unit: "dBc",
        message: `Harmonic ${h.order} at ${fixed(level, 1)} dBc against a maximum of ${limit} dBc: ${verdictWords(passed, margin, 1, "dB")}.`,
      };
    });
}

function amplitudeCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.minFundamentalVpk)) return null;
  const margin = m.fundamentalVpk - spec.minFundamentalVpk;
  const passed = margin >= 0;
  return {
    rule: "amplitude",
    passed,
    measured: m.fundamentalVpk,
    limit: spec.minFundamentalVpk,
    margin,
    unit: "V",
    message:
      `Fundamental ${formatEngineering(m.fundamentalVpk, "V", 4)} peak against a minimum of ` +
      `${formatEngineering(spec.minFundamentalVpk, "V", 4)}: ${passed ? (margin === 0 ? "exactly at the limit" : `above by ${formatEngineering(margin, "V", 3)}`) : `below by ${formatEngineering(-margin, "V", 3)}`}.`,
  };
}

function driftCheck(spec: DesignSpec, m: SpecMeasurements): SpecCheck | null {
  if (!isSet(spec.maxDriftPpm)) return null;
  if (!isSet(m.inRecordDriftPpm)) {
    const flagged = m.warnings.find((w) => w.code === "in-record-drift");
    return {
      rule: "in-record-drift",
      passed: !flagged,
      measured: null,
      limit: spec.maxDriftPpm,
      margin: null,
      unit: "ppm",
      message: flagged
        ? `The frequency moved within the record (${flagged.message}); the ${spec.maxDriftPpm} ppm limit cannot be shown to hold.`
        : `No frequency change within the record was detectable; the limit is ${spec.maxDriftPpm} ppm.`,
    };
  }
  const size = Math.abs(m.inRecordDriftPpm);
  const margin = spec.maxDriftPpm - size;
  const passed = margin >= 0;
  return {
    rule: "in-record-drift",
    passed,
    measured: m.inRecordDriftPpm,
    limit: spec.maxDriftPpm,
    margin,
    unit: "ppm",
    message: `Frequency moved ${signed(m.inRecordDriftPpm, 1)} ppm within the record against a maximum of ${spec.maxDriftPpm} ppm: ${verdictWords(passed, margin, 1, "ppm")}.`,
  };
}

function warningChecks(m: SpecMeasurements): SpecCheck[] {
  return m.warnings
    .filter((w) => FAILING_WARNINGS.includes(w.code))
    .map((w) => ({
      rule: `warning-${w.code}`,
      passed: false,
      measured: null,
      limit: null,
      margin: null,
      unit: "",
      message: `${w.message} A run with this warning cannot pass its spec.`,
    }));
}

/**
 * Evaluates every rule of a spec against one analysed capture.
 *
 * Limits are inclusive (a value exactly at its limit passes). A `clipping` or `not-steady` warning fails the run
 * whether or not the design has a spec, because such a record does not show the oscillator's steady state.
 *
 * @param spec - the design's spec at the run's revision; unset limits are skipped.
 * @param measurements - the engine's numbers for the capture (frequency in Hz, THD in %, levels in dBc, amplitude in V peak).
 * @returns the checks in a fixed order (frequency, THD, harmonics by order, amplitude, drift, warnings) and the verdict:
 *   null when nothing was checked, fail when any check failed, pass otherwise.
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
  checks.push(...harmonicChecks(spec, measurements));
  push(amplitudeCheck(spec, measurements));
  push(driftCheck(spec, measurements));
  checks.push(...warningChecks(measurements));
  const verdict = checks.length === 0 ? null : checks.every((c) => c.passed) ? "pass" : "fail";
  return { verdict, checks };
}

/** True when the spec sets at least one limit (a design without one gets no verdict unless a warning fails it). */
export function hasAnyLimit(spec: DesignSpec): boolean {
  return (
    (isSet(spec.targetHz) && isSet(spec.toleranceValue)) ||
    isSet(spec.maxThdPercent) ||
    isSet(spec.maxHarmonicDbc) ||
    isSet(spec.minFundamentalVpk) ||
    isSet(spec.maxDriftPpm)
  );
}
