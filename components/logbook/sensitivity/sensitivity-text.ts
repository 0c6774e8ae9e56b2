import { DASH, formatQuantity, typographicMinus } from "@/lib/format/numbers";
import type { PredictedTempco, RepeatSetReport, SlopeFigure } from "@/lib/sensitivity/types";

// Words and numbers of the Sensitivity card and the report, in one place so both say the same thing. Pure.

/** Decimals that show a 1σ with two significant figures (at most 6). */
function decimalsForSigma(sigma: number): number {
  if (!(sigma > 0) || !Number.isFinite(sigma)) return 1;
  return Math.min(6, Math.max(0, 1 - Math.floor(Math.log10(sigma))));
}

/**
 * A value with its 1σ in a plain unit, both to the σ's second significant figure: −45.2 ± 8.1 ppm/K.
 * @param value - the value; non-finite shows as "—"
 * @param sigma - its 1σ (same unit)
 * @param unit - e.g. "ppm/V"
 */
export function valueWithSigma(value: number, sigma: number | null, unit: string): string {
  if (!Number.isFinite(value)) return DASH;
  const decimals = sigma !== null ? decimalsForSigma(sigma) : 1;
  const v = typographicMinus(value.toFixed(decimals).replace(/^-(0\.?0*)$/, "$1"));
  const signed = value > 0 && Number(value.toFixed(decimals)) !== 0 ? `+${v}` : v;
  return sigma !== null && Number.isFinite(sigma) ? `${signed} ± ${sigma.toFixed(decimals)} ${unit}` : `${signed} ${unit}`;
}

/** "−12.0 ± 1.3 ppm/V" for a measured relative slope, or null when not measured. */
export function ppmSlopeText(figure: SlopeFigure, unit: "ppm/V" | "ppm/K"): string | null {
  if (!figure.measured || figure.ppm === null) return null;
  return valueWithSigma(figure.ppm, figure.ppmSigma, unit);
}

/** The same slope in absolute units: "−4.45 ± 0.48 Hz/V". */
export function absoluteSlopeText(figure: SlopeFigure, unit: string): string | null {
  if (!figure.measured) return null;
  return valueWithSigma(figure.slope, figure.slopeSigma, unit);
}

/** How a slope's σ was found, in words. */
export function sigmaBasisText(figure: SlopeFigure): string | null {
  if (!figure.measured) return null;
  const runs = `${figure.runs} runs`;
  const held = figure.heldConstant.length ? `, ${figure.heldConstant.join(" and ")} held in the fit` : "";
  if (figure.sigmaBasis === "stated") return `${runs}, weighted by each capture's frequency 1σ${held}`;
  if (figure.sigmaBasis === "stated-and-scatter") {
    return `${runs}, weighted by each capture's frequency 1σ; 1σ widened ×${Math.sqrt(figure.reducedChiSquare ?? 1).toFixed(1)} (√χ²ν) because the runs scatter more than their own uncertainties say${held}`;
  }
  return `${runs}, 1σ from the scatter about the line (amplitudes carry no stated uncertainty)${held}`;
}

/** "the parts predict −30 ppm/K (−45 … −15 with the tempco spreads)" or why they predict nothing. */
export function predictedTempcoText(p: PredictedTempco): string {
  if (!p.predicted) return `no prediction: ${p.reason}`;
  const range = Math.abs(p.maxPpmPerK - p.minPpmPerK) > 0.05 ? ` (${valueWithSigma(p.minPpmPerK, null, "").trim()} … ${valueWithSigma(p.maxPpmPerK, null, "ppm/K")} over the tempco spreads)` : "";
  const without = p.partsWithout.length ? `; ${p.partsWithout.join(", ")} ${p.partsWithout.length === 1 ? "has" : "have"} no tempco entered and ${p.partsWithout.length === 1 ? "is" : "are"} taken as not moving` : "";
  return `the parts predict ${valueWithSigma(p.ppmPerK, null, "ppm/K")}${range}${without}`;
}

/** The headline sentence for the temperature coefficient: "measured −45 ± 8 ppm/K; the parts predict −30 ppm/K". */
export function tempcoSentence(tempco: SlopeFigure, predicted: PredictedTempco): string {
  const measured = ppmSlopeText(tempco, "ppm/K");
  return `${measured ? `measured ${measured}` : `not measured: ${(tempco as { reason: string }).reason}`}; ${predictedTempcoText(predicted)}`;
}

/** An Allan deviation (fractional) in words: "3.1 × 10⁻⁷". */
export function fractionText(value: number | null): string {
  if (value === null || !Number.isFinite(value)) return DASH;
  if (value === 0) return "0";
  const exponent = Math.floor(Math.log10(value));
  const mantissa = value / 10 ** exponent;
  const superscript = String(exponent)
    .split("")
    .map((c) => ({ "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" })[c] ?? c)
    .join("");
  return `${mantissa.toFixed(1)} × 10${superscript}`;
}

/** A time between runs: "40 min", "2.5 h", "3 d". */
export function spacingText(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return DASH;
  if (seconds < 120) return `${Math.round(seconds)} s`;
  if (seconds < 2 * 3600) return `${Math.round(seconds / 60)} min`;
  if (seconds < 2 * 86400) return `${(seconds / 3600).toFixed(1)} h`;
  return `${(seconds / 86400).toFixed(1)} d`;
}

/** The condition of a repeat set: "12 V, 23 °C" (or "supply not recorded"). */
export function conditionText(set: Pick<RepeatSetReport, "supplyV" | "temperatureC">): string {
  const supply = set.supplyV === null ? "supply not recorded" : formatQuantity(set.supplyV, "V", 3);
  const temperature = set.temperatureC === null ? "temperature not recorded" : `${typographicMinus(String(Number(set.temperatureC.toFixed(1))))} °C`;
  return `${supply}, ${temperature}`;
}

/** A reduced χ² to three figures, without exponent form ("0.0629", "11300"). */
function chiText(value: number | null): string {
  if (value === null || !Number.isFinite(value)) return DASH;
  return value >= 1000 ? String(Math.round(Number(value.toPrecision(3)))) : String(Number(value.toPrecision(3)));
}

/** The verdict of a repeat set in words. */
export function repeatVerdictText(set: RepeatSetReport, level: number): string {
  if (set.reason) return `not tested: ${set.reason}`;
  const p = set.pValue !== null ? (set.pValue < 1e-4 ? "p < 0.0001" : `p = ${set.pValue.toPrecision(2)}`) : "";
  return set.flagged
    ? `scatter larger than the runs' uncertainties explain (χ²ν = ${chiText(set.reducedChiSquare)}, ${p} < ${level}): the build is unstable or something in the set-up moved`
    : `scatter within the runs' uncertainties (χ²ν = ${chiText(set.reducedChiSquare)}, ${p})`;
}
