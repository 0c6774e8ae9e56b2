/**
 * The values a bench could hold. One table for every entry point (the predict command, the design and tweak
 * forms, the API), so the same absurd value is refused everywhere with the same words. The README's
 * "Limits on entered values" states these ranges; keep the two together.
 */

import { formatEngineering } from "./units";

export interface QuantityLimit {
  /** Smallest accepted value, SI units. */
  min: number;
  /** Largest accepted value, SI units. */
  max: number;
  /** True when `min` itself is refused (a temperature change that reaches absolute zero). */
  minExclusive?: boolean;
  /** Unit symbol for messages ("H", "F", "Hz", "K", "ppm/K"; "" for a ratio). */
  unit: string;
  /** Why the range ends where it does, for the README and the messages' readers. */
  why: string;
}

/** Reference temperature of tempco figures, °C (datasheets quote coefficients from 25 °C: common practice). */
export const REFERENCE_TEMPERATURE_C = 25;

/** 0 K in °C. */
const ABSOLUTE_ZERO_C = -273.15;

export const LIMITS = {
  /** A short trace is about 1 nH; the largest iron-cored chokes on a bench are a few henries. */
  inductanceH: { min: 1e-9, max: 10, unit: "H", why: "a trace is about 1 nH, a large iron-cored choke a few henries" },
  /** Mutual inductance may be 0 (uncoupled windings); its upper end also follows from M ≤ √(L1·L2). */
  mutualInductanceH: { min: 0, max: 10, unit: "H", why: "0 for uncoupled windings, and never above the windings themselves" },
  /** Below 0.1 pF is stray, not a part; above 10 mF is an electrolytic, not a tank capacitor. */
  capacitanceF: { min: 0.1e-12, max: 10e-3, unit: "F", why: "below 0.1 pF is stray, above 10 mF is no tank capacitor" },
  /** Stray, probe and trimmer capacitance across the tank: none at all up to a large padder. */
  extraCapacitanceF: { min: 0, max: 1e-6, unit: "F", why: "stray, probe and trimmer capacitance is pF to nF" },
  /** Targets and measurements: a sub-hertz LC is a curiosity, above 20 GHz a lumped LC model no longer holds. */
  frequencyHz: { min: 0.1, max: 20e9, unit: "Hz", why: "a lumped LC model holds from sub-hertz to microwave" },
  /** A symmetric tolerance wider than ±50 % is a variable part (a trimmer), not a tolerance. */
  tolerance: { min: 0, max: 0.5, unit: "", why: "wider than ±50 % is a trimmer, not a tolerance" },
  /** Class 1 ceramics reach N4700 (−4700 ppm/K); ±10 000 ppm/K covers every part made. */
  tempcoPpmPerK: { min: -10_000, max: 10_000, unit: "ppm/K", why: "N4700 ceramics are the steepest parts made" },
  /** The spread on a tempco, 0 (exact) up to the same bound. */
  tempcoSpreadPpmPerK: { min: 0, max: 10_000, unit: "ppm/K", why: "the same bound as the coefficient" },
  /** From 25 °C: never down to absolute zero, and no more than +500 K (a soldering iron is 350 °C). */
  temperatureChangeK: {
    min: ABSOLUTE_ZERO_C - REFERENCE_TEMPERATURE_C,
    minExclusive: true,
    max: 500,
    unit: "K",
    why: "from the 25 °C reference, absolute zero is 298.15 K below",
  },
  /**
   * Feedback fraction β of a Colpitts, Clapp or Hartley: a transistor stage gives a voltage gain of a few to a
   * thousand or so, so β below 10⁻³ can never start, and above 10³ the divider is a short.
   */
  feedbackFraction: { min: 1e-3, max: 1e3, unit: "", why: "a transistor stage's gain is up to about 1000" },
} as const satisfies Record<string, QuantityLimit>;

export type LimitName = keyof typeof LIMITS;

/**
 * A value as a message shows it: engineering notation with its unit ("14.86 µH"), a percentage for tolerances.
 *
 * @param value - SI units (tolerance as a fraction).
 * @param name - which limit's unit to use.
 */
export function formatLimitValue(value: number, name: LimitName): string {
  if (!Number.isFinite(value)) return String(value);
  const limit: QuantityLimit = LIMITS[name];
  if (name === "tolerance") return `${Number((value * 100).toPrecision(4))} %`;
  if (limit.unit === "") return String(Number(value.toPrecision(4)));
  if (limit.unit === "K" || limit.unit === "ppm/K") return `${Number(value.toPrecision(6))} ${limit.unit}`;
  return formatEngineering(value, limit.unit, 4, { trimZeros: true });
}

/** "from 1 nH to 10 H" (or "above −298.15 K and up to 500 K"). */
export function describeLimit(name: LimitName): string {
  const limit: QuantityLimit = LIMITS[name];
  const low = formatLimitValue(limit.min, name);
  const high = formatLimitValue(limit.max, name);
  return limit.minExclusive ? `above ${low} and up to ${high}` : `from ${low} to ${high}`;
}

/**
 * Checks one value against its limit.
 *
 * @param name - the limit.
 * @param value - SI units.
 * @param subject - what the value is, as it starts the message ("part L (tank inductor)", "the target frequency").
 * @returns null when the value is finite and within the limit, else a message naming the subject, the range and
 *   the value in engineering notation, e.g. "part L (tank inductor) must be from 1 nH to 10 H; got 1e30 H".
 */
export function limitProblem(name: LimitName, value: number, subject: string): string | null {
  const limit: QuantityLimit = LIMITS[name];
  if (typeof value !== "number" || !Number.isFinite(value)) {
    return `${subject} must be a finite number${limit.unit ? ` of ${limit.unit}` : ""}; got ${String(value)}`;
  }
  const low = limit.minExclusive ? value <= limit.min : value < limit.min;
  if (!low && value <= limit.max) return null;
  const suffix = name === "temperatureChangeK" && low ? " (that is at or below absolute zero)" : "";
  return `${subject} must be ${describeLimit(name)}; got ${formatLimitValue(value, name)}${suffix}`;
}

/**
 * {@link limitProblem} for code paths that want an exception.
 *
 * @throws RangeError with the message when the value is outside its limit.
 */
export function assertWithinLimit(name: LimitName, value: number, subject: string): void {
  const problem = limitProblem(name, value, subject);
  if (problem) throw new RangeError(problem);
}
