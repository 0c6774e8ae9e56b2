import { applySpecPreset } from "@/lib/spec/presets";
import type { DesignSpec, ToleranceUnit } from "@/lib/spec/types";

/** The spec fields of the design form as typed text (the form's own draft shape for these fields). */
export interface SpecTextFields {
  targetHz: string;
  toleranceValue: string;
  toleranceUnit: ToleranceUnit;
  maxThdPercent: string;
  maxHarmonicDbc: string;
  minFundamentalVpk: string;
  maxDriftPpm: string;
  /** The stability limits, when the form has them (seconds and ppm as plain numbers). */
  maxRmsJitterS?: string;
  maxPushingPpmPerV?: string;
  maxTempcoPpmPerK?: string;
  phaseNoiseOffsetHz?: string;
  maxPhaseNoiseDbcPerHz?: string;
  maxStartUpS?: string;
}

/** The stability limits a preset may write, as typed text. */
const STABILITY_KEYS = ["maxRmsJitterS", "maxPushingPpmPerV", "maxTempcoPpmPerK", "phaseNoiseOffsetHz", "maxPhaseNoiseDbcPerHz", "maxStartUpS"] as const;

function plainNumber(text: string): number | null {
  const t = text.trim().replace(/\u2212/g, "-");
  if (t === "" || !/^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(t)) return null;
  return Number(t);
}

/**
 * The typed limits as a spec, for matching presets. The target stays out: it is typed with prefixes (412.3k) and
 * no preset sets it.
 */
export function specOfText(fields: SpecTextFields): DesignSpec {
  const stability: DesignSpec = {};
  for (const key of STABILITY_KEYS) {
    const text = fields[key];
    if (text !== undefined) stability[key] = plainNumber(text);
  }
  return {
    ...stability,
    toleranceValue: plainNumber(fields.toleranceValue),
    toleranceUnit: fields.toleranceUnit,
    maxThdPercent: plainNumber(fields.maxThdPercent),
    maxHarmonicDbc: plainNumber(fields.maxHarmonicDbc),
    minFundamentalVpk: plainNumber(fields.minFundamentalVpk),
    maxDriftPpm: plainNumber(fields.maxDriftPpm),
  };
}

/**
 * Applies a preset to the typed spec fields with lib/spec's {@link applySpecPreset}: the fields the preset sets
 * are rewritten as text, every other field keeps exactly what was typed.
 *
 * @param fields - the form's spec text.
 * @param presetId - a preset id.
 * @returns new fields; the input is not changed.
 * @throws RangeError when the preset id is unknown.
 */
export function applyPresetToText<T extends SpecTextFields>(fields: T, presetId: string): T {
  const before = specOfText(fields);
  const after = applySpecPreset(before, presetId);
  const next = { ...fields };
  for (const key of ["toleranceValue", "maxThdPercent", "maxHarmonicDbc", "minFundamentalVpk", "maxDriftPpm"] as const) {
    const value = after[key];
    if (value !== before[key] && typeof value === "number") next[key] = String(value);
  }
  for (const key of STABILITY_KEYS) {
    const value = after[key];
    if (key in fields && value !== before[key] && typeof value === "number") next[key] = String(value);
  }
  if (after.toleranceUnit && after.toleranceUnit !== before.toleranceUnit) next.toleranceUnit = after.toleranceUnit;
  return next;
}
