/**
 * The implied extra capacitance of a build's runs, read as a trend across its tweaks. Each run's value is the
 * equivalent parallel capacitance that would move the prediction onto the measurement (lib/oscillator/drift.ts).
 * When it stays put while parts are swapped and leads moved, it belongs to the build itself (layout, transistor,
 * probe): a parasitic to design in. When it moves from one tweak to the next, the tweaks themselves changed it.
 * Pure: no I/O.
 */

/** One analysed run, oldest first. */
export interface ImpliedCapacitancePoint {
  /** Equivalent parallel capacitance that explains the drift, F (signed); null when the run has none. */
  impliedExtraCapacitanceF: number | null;
  /** Standard uncertainty of that value, F; null when unknown. */
  uncertaintyF?: number | null;
  /**
   * Which stretch of the build the run belongs to: runs between the same two applied tweaks share a segment.
   * Any applied tweak starts a new one, a note-only tweak too (shorter leads change the layout).
   */
  segment: number;
}

/** A run of consecutive points in one segment, with their mean. */
export interface ImpliedCapacitanceSegment {
  segment: number;
  count: number;
  meanF: number;
}

export type ImpliedCapacitanceVerdict =
  /** Fewer than two runs with a value. */
  | "too-few-runs"
  /** Several runs, but no tweak between them yet: only the repeatability is known. */
  | "untested"
  /** The value holds across tweaks. */
  | "steady"
  /** The value moves from one tweak to the next. */
  | "changing";

export interface ImpliedCapacitanceTrend {
  verdict: ImpliedCapacitanceVerdict;
  /** Segments that have at least one value, in order. */
  segments: ImpliedCapacitanceSegment[];
  /** Mean of the segment means, F; null without values. */
  typicalF: number | null;
  /** Largest minus smallest segment mean, F; 0 with one segment. */
  spreadF: number;
  /** How far apart two segment means may be and still count as the same value, F. */
  allowanceF: number;
  /** Run-to-run scatter within segments (pooled standard deviation), F; null when no segment has two runs. */
  repeatabilityF: number | null;
  /** The biggest move between neighbouring segments: from which segment to which, and by how much (F, signed). */
  largestStep: { fromSegment: number; toSegment: number; changeF: number } | null;
  /** The verdict in plain words for the page. */
  summary: string;
}

/** Below this no bench measurement of stray capacitance means anything (a probe tip alone is several pF). */
export const MIN_ALLOWANCE_F = 1e-12;
/** Segment means within this fraction of the typical value are the same value (our choice, not a standard). */
export const RELATIVE_ALLOWANCE = 0.05;
/** Means further apart than this many combined standard deviations differ (about 99.7 % for normal scatter). */
export const SIGMA_ALLOWANCE = 3;

function isNumber(value: number | null | undefined): value is number {
  return typeof value === "number" && Number.isFinite(value);
}

function picofarads(valueF: number, signed: boolean): string {
  const pf = valueF * 1e12;
  const text = Math.abs(pf) >= 100 ? Math.abs(pf).toFixed(0) : Math.abs(pf).toFixed(1);
  if (!signed) return `${text} pF`;
  return `${pf > 0 ? "+" : pf < 0 ? "\u2212" : ""}${text} pF`;
}

/**
 * The standard uncertainty of an implied capacitance from the frequency's. From C_s = 1/((2πf)²·L_eff) − C_eff,
 * dC_s/df = −2·(C_eff + C_s)/f, so σ_C = 2·(C_eff + C_s)·σ_f / f.
 *
 * @param cEffF - effective capacitance of the model, F, above 0.
 * @param impliedF - the implied extra capacitance, F (signed).
 * @param measuredHz - measured frequency, Hz, above 0.
 * @param uncertaintyHz - standard uncertainty of the frequency, Hz, 0 or above.
 * @returns σ in F, or null when an input is missing or out of range.
 */
export function impliedCapacitanceUncertaintyF(
  cEffF: number | null | undefined,
  impliedF: number | null | undefined,
  measuredHz: number | null | undefined,
  uncertaintyHz: number | null | undefined,
): number | null {
  if (!isNumber(cEffF) || !isNumber(impliedF) || !isNumber(measuredHz) || !isNumber(uncertaintyHz)) return null;
  if (cEffF <= 0 || measuredHz <= 0 || uncertaintyHz < 0) return null;
  return (2 * Math.abs(cEffF + impliedF) * uncertaintyHz) / measuredHz;
}

/**
 * What the sign of an implied capacitance means, in one plain sentence.
 *
 * @param impliedF - F, signed; positive when the measured frequency is below the prediction.
 * @returns "more" (extra capacitance, as layout stray adds), "less" (the tank has less than modelled, which no
 *   stray can cause) or "none" (within 0.05 pF of zero), with the sentence.
 */
export function impliedCapacitanceSign(impliedF: number): { sign: "more" | "less" | "none"; phrase: string } {
  if (!Number.isFinite(impliedF)) throw new RangeError(`implied capacitance must be a finite number of farads; got ${impliedF}`);
  if (Math.abs(impliedF) < 0.05e-12) return { sign: "none", phrase: "The measurement matches the model: no extra capacitance is implied." };
  if (impliedF > 0) {
    return {
      sign: "more",
      phrase: "Positive: the tank behaves as if this much capacitance sat across it, as layout stray, the transistor and the probe add.",
    };
  }
  return {
    sign: "less",
    phrase: "Negative: the tank has less capacitance or inductance than the model, which no stray can cause; look for a part below its nominal value or a smaller coil.",
  };
}

function mean(values: number[]): number {
  return values.reduce((s, v) => s + v, 0) / values.length;
}

/**
 * Classifies the implied extra capacitance of a build's runs across its tweaks.
 *
 * Segment means count as one value when they lie within the allowance: the largest of {@link MIN_ALLOWANCE_F},
 * {@link RELATIVE_ALLOWANCE} of the typical value, and {@link SIGMA_ALLOWANCE} combined standard deviations of two
 * runs (√2 × the larger of the pooled within-segment scatter and the typical measurement uncertainty).
 *
 * @param points - the analysed runs oldest first; points without a value are skipped.
 * @returns the verdict, the segment means, the spread against the allowance and a sentence for the page.
 * @throws RangeError when a segment number is not an integer.
 */
export function classifyImpliedCapacitanceTrend(points: readonly ImpliedCapacitancePoint[]): ImpliedCapacitanceTrend {
  for (const p of points) {
    if (!Number.isInteger(p.segment)) throw new RangeError(`segment must be an integer; got ${p.segment}`);
  }
  const valued = points.filter((p): p is ImpliedCapacitancePoint & { impliedExtraCapacitanceF: number } => isNumber(p.impliedExtraCapacitanceF));
  const bySegment = new Map<number, number[]>();
  for (const p of valued) bySegment.set(p.segment, [...(bySegment.get(p.segment) ?? []), p.impliedExtraCapacitanceF]);
  const segments = [...bySegment.entries()]
    .sort(([a], [b]) => a - b)
    .map(([segment, values]) => ({ segment, count: values.length, meanF: mean(values) }));

  // Pooled within-segment standard deviation: the run-to-run scatter with the parts left alone.
  let squares = 0;
  let degrees = 0;
  for (const values of bySegment.values()) {
    if (values.length < 2) continue;
    const m = mean(values);
    squares += values.reduce((s, v) => s + (v - m) ** 2, 0);
    degrees += values.length - 1;
  }
  const repeatabilityF = degrees > 0 ? Math.sqrt(squares / degrees) : null;
  const uncertainties = valued.map((p) => p.uncertaintyF).filter(isNumber);
  const measurementF = uncertainties.length > 0 ? mean(uncertainties) : 0;
  const noiseF = Math.max(repeatabilityF ?? 0, measurementF);

  const typicalF = segments.length > 0 ? mean(segments.map((s) => s.meanF)) : null;
  const means = segments.map((s) => s.meanF);
  const spreadF = means.length > 1 ? Math.max(...means) - Math.min(...means) : 0;
  const allowanceF = Math.max(MIN_ALLOWANCE_F, RELATIVE_ALLOWANCE * Math.abs(typicalF ?? 0), SIGMA_ALLOWANCE * Math.SQRT2 * noiseF);

  let largestStep: ImpliedCapacitanceTrend["largestStep"] = null;
  for (let i = 1; i < segments.length; i++) {
    const changeF = segments[i].meanF - segments[i - 1].meanF;
    if (!largestStep || Math.abs(changeF) > Math.abs(largestStep.changeF)) {
      largestStep = { fromSegment: segments[i - 1].segment, toSegment: segments[i].segment, changeF };
    }
  }

  const base = { segments, typicalF, spreadF, allowanceF, repeatabilityF, largestStep };
  if (valued.length < 2) {
    return {
      ...base,
      verdict: "too-few-runs",
      summary:
        valued.length === 0
          ? "No analysed run with a prediction yet, so no capacitance is implied."
          : "One run so far. Log another capture after the next tweak to see whether this value stays put.",
    };
  }
  if (segments.length < 2) {
    const scatter = repeatabilityF !== null ? ` Runs repeat within ${picofarads(repeatabilityF, false)}.` : "";
    return {
      ...base,
      verdict: "untested",
      summary: `About ${picofarads(typicalF!, true)} on every run, but no tweak between them yet.${scatter} A capture after the next tweak tells whether it belongs to the layout.`,
    };
  }
  if (spreadF <= allowanceF) {
    const summary =
      typicalF! >= 0
        ? `Steady at about ${picofarads(typicalF!, true)} across ${segments.length - 1} ${segments.length === 2 ? "tweak" : "tweaks"} ` +
          `(spread ${picofarads(spreadF, false)}): a layout parasitic — design it in, as known extra capacitance in the design.`
        : `Steady at about ${picofarads(typicalF!, true)} across ${segments.length - 1} ${segments.length === 2 ? "tweak" : "tweaks"} ` +
          `(spread ${picofarads(spreadF, false)}): the build itself differs from the model — design it in by correcting the part values or the coil, not the layout.`;
    return { ...base, verdict: "steady", summary };
  }
  return {
    ...base,
    verdict: "changing",
    summary:
      `It moves with the tweaks (spread ${picofarads(spreadF, false)}, more than the ${picofarads(allowanceF, false)} runs agree within): ` +
      `the tweaks themselves moved it, so it is not one fixed parasitic to design in.`,
  };
}
