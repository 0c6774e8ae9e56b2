/**
 * Display formatting of measured and predicted numbers for the pages. Pure and framework-free.
 *
 * The engineering-notation core is lib/oscillator's {@link formatEngineering}; this module adds what a page
 * needs on top: the typographic minus (U+2212), signs on differences, uncertainties beside values, decibels,
 * ppm and percent. Numbers and units are joined by a normal space; the pages keep them on one line with CSS.
 */
import { formatEngineering } from "@/lib/oscillator/units";

/** The typographic minus sign used on screen. */
export const MINUS = "\u2212";

/** What a missing or non-finite value shows as. */
export const DASH = "\u2014";

/** Replaces ASCII hyphen-minus signs (leading, or after "e" in exponent form) with U+2212. */
export function typographicMinus(text: string): string {
  return text.replace(/(^|[\se(])-/g, `$1${MINUS}`);
}

function isNumber(value: number | null | undefined): value is number {
  return typeof value === "number" && Number.isFinite(value);
}

function checkFigures(significantFigures: number): void {
  if (!Number.isInteger(significantFigures) || significantFigures < 1 || significantFigures > 15) {
    throw new RangeError(`significant figures must be an integer from 1 to 15; got ${significantFigures}`);
  }
}

/**
 * A value in engineering notation with its unit, for display.
 *
 * @param value - the value in SI base units (Hz, F, H, V, s); null, undefined or non-finite shows as "—".
 * @param unit - the unit symbol ("Hz", "F", "V", …; "" for none).
 * @param significantFigures - 1 to 15; default 4.
 * @param options.trimZeros - drop trailing zeros after the decimal point (for part values: "4.7 nF").
 * @param options.signed - prefix "+" on positive values (for differences).
 * @returns e.g. `formatQuantity(412307, "Hz", 6)` → "412.307 kHz"; `formatQuantity(-0.0123, "V", 3)` → "−12.3 mV".
 * @throws RangeError when `significantFigures` is not an integer from 1 to 15.
 */
export function formatQuantity(
  value: number | null | undefined,
  unit: string,
  significantFigures = 4,
  options: { trimZeros?: boolean; signed?: boolean } = {},
): string {
  checkFigures(significantFigures);
  if (!isNumber(value)) return DASH;
  const text = typographicMinus(formatEngineering(value, unit, significantFigures, { trimZeros: options.trimZeros }));
  return options.signed && value > 0 ? `+${text}` : text;
}

/**
 * A part value as people write it on a schematic: engineering notation, trailing zeros dropped.
 *
 * @param valueSi - F, H, or a bare number for a coupling coefficient.
 * @param unit - "F", "H" or "".
 * @returns e.g. 4.7e-9, "F" → "4.7 nF"; 1e-5, "H" → "10 µH".
 */
export function formatPartValue(valueSi: number | null | undefined, unit: string, significantFigures = 4): string {
  return formatQuantity(valueSi, unit, significantFigures, { trimZeros: true });
}

/** The decimal exponent of the last significant digit of `value` at `figures` significant figures. */
function lastDigitExponent(value: number, figures: number): number {
  return Math.floor(Math.log10(Math.abs(value))) - (figures - 1);
}

/**
 * Significant figures for an uncertainty: two when its leading digit is 1 (so 0.14 does not round to 0.1,
 * a 40 % change), otherwise one. Common practice in metrology write-ups.
 */
function uncertaintyFigures(uncertainty: number): number {
  const leading = Number(Math.abs(uncertainty).toExponential(0).charAt(0));
  return leading === 1 ? 2 : 1;
}

/**
 * A value with its standard uncertainty, the value rounded to the uncertainty's last digit.
 *
 * @param value - SI base units.
 * @param uncertainty - standard uncertainty in the same units, above 0; missing or 0 shows the value alone at
 *   `fallbackFigures`.
 * @param unit - unit symbol.
 * @param fallbackFigures - significant figures when there is no usable uncertainty; default 6.
 * @param maxFigures - most significant figures the value may take (a narrow table column); default 12.
 * @returns the value and the uncertainty as separate strings (so a page can set them apart) and both joined,
 *   e.g. 412307.123, 0.83, "Hz" → { value: "412.3071 kHz", uncertainty: "± 0.8 Hz", text: "412.3071 kHz ± 0.8 Hz" }.
 *   The figures of the value are held between 2 and 12, so an uncertainty larger than the value still prints.
 */
export function formatWithUncertainty(
  value: number | null | undefined,
  uncertainty: number | null | undefined,
  unit: string,
  fallbackFigures = 6,
  maxFigures = 12,
): { value: string; uncertainty: string; text: string } {
  if (!isNumber(value)) return { value: DASH, uncertainty: "", text: DASH };
  if (!isNumber(uncertainty) || uncertainty <= 0 || value === 0) {
    const text = formatQuantity(value, unit, fallbackFigures);
    return { value: text, uncertainty: "", text };
  }
  const uFigures = uncertaintyFigures(uncertainty);
  const lastExponent = lastDigitExponent(uncertainty, uFigures);
  const valueFigures = Math.min(maxFigures, Math.max(1, Math.floor(Math.log10(Math.abs(value))) - lastExponent + 1));
  const valueText = formatQuantity(value, unit, valueFigures);
  const uncertaintyText = `± ${formatSmallFigures(uncertainty, unit, uFigures)}`;
  return { value: valueText, uncertainty: uncertaintyText, text: `${valueText} ${uncertaintyText}` };
}

/**
 * Like {@link formatQuantity} for a one- or two-figure number, but a mantissa in the hundreds moves up a prefix
 * ("0.8 Hz", not "800 mHz"), which reads better beside a value in the larger unit.
 */
function formatSmallFigures(value: number, unit: string, figures: number): string {
  const rounded = Number(value.toPrecision(figures));
  const exponent = Math.floor(Math.log10(Math.abs(rounded)));
  const inHundreds = ((exponent % 3) + 3) % 3 === 2;
  if (!inHundreds) return formatQuantity(rounded, unit, figures);
  const exponent3 = exponent + 1;
  const scale = Number(`1e${exponent3}`);
  // Take the prefix and unit from the shared formatter, so the prefix table lives in one place.
  const prefixed = formatEngineering(scale, unit, 1);
  if (unit === "" || prefixed.includes("e")) return formatQuantity(rounded, unit, figures);
  const mantissa = (rounded / scale).toFixed(exponent3 - exponent + figures - 1);
  return typographicMinus(`${mantissa} ${prefixed.split(" ")[1]}`);
}

/** Fixed decimals with the typographic minus; "-0.0" becomes "0.0". */
function fixed(value: number, decimals: number, signed: boolean): string {
  let text = value.toFixed(decimals);
  if (/^-0(\.0+)?$/.test(text)) text = text.slice(1);
  if (text.startsWith("-")) return `${MINUS}${text.slice(1)}`;
  return signed && Number(text) > 0 ? `+${text}` : text;
}

/**
 * A level in decibels.
 *
 * @param valueDb - the level in dB (dBc, dBV, dB).
 * @param unit - "dBc", "dBV" or "dB"; default "dB".
 * @param decimals - default 1.
 * @returns e.g. -38.24, "dBc" → "−38.2 dBc".
 */
export function formatDecibels(valueDb: number | null | undefined, unit = "dB", decimals = 1): string {
  if (!isNumber(valueDb)) return DASH;
  return `${fixed(valueDb, decimals, false)} ${unit}`;
}

/** Decimals that give `figures` significant figures for |value| (at least 0, at most 6). */
function decimalsFor(value: number, figures: number, maxDecimals = 6): number {
  if (value === 0) return 0;
  return Math.min(maxDecimals, Math.max(0, figures - 1 - Math.floor(Math.log10(Math.abs(value)))));
}

/**
 * A relative difference in parts per million, always signed.
 *
 * @param ppm - the difference in ppm.
 * @param significantFigures - default 3; never finer than 0.1 ppm.
 * @returns e.g. 1234.5 → "+1235 ppm"; -12.34 → "−12.3 ppm"; 0 → "0 ppm".
 */
export function formatPpm(ppm: number | null | undefined, significantFigures = 3): string {
  if (!isNumber(ppm)) return DASH;
  // Below a tenth of a ppm no bench measurement is meaningful, so one decimal is the finest shown.
  return `${fixed(ppm, decimalsFor(ppm, significantFigures, 1), true)} ppm`;
}

/**
 * A percentage.
 *
 * @param percent - the value in percent (1.5 for 1.5 %).
 * @param significantFigures - default 3.
 * @param options.signed - prefix "+" on positive values (for drift).
 * @returns e.g. 0.12345 → "0.123 %"; with signed, -2.5 → "−2.50 %".
 */
export function formatPercent(
  percent: number | null | undefined,
  significantFigures = 3,
  options: { signed?: boolean } = {},
): string {
  if (!isNumber(percent)) return DASH;
  return `${fixed(percent, decimalsFor(percent, significantFigures), options.signed ?? false)} %`;
}

/**
 * A drift in both forms a technician reads: ppm and percent.
 *
 * @param driftPpm - (measured − predicted) / predicted × 10⁶.
 * @returns e.g. -1520 → { ppm: "−1520 ppm", percent: "−0.152 %" }.
 */
export function formatDrift(driftPpm: number | null | undefined): { ppm: string; percent: string } {
  if (!isNumber(driftPpm)) return { ppm: DASH, percent: DASH };
  return { ppm: formatPpm(driftPpm), percent: formatPercent(driftPpm / 1e4, 3, { signed: true }) };
}

/**
 * A drift with the form to show first: past 1 % the percentage reads better than a six-digit ppm figure.
 *
 * @param driftPpm - (measured − predicted) / predicted × 10⁶.
 * @returns main in ppm below 10 000 ppm and in percent from there, detail in the other form;
 *   e.g. -1520 → { main: "−1520 ppm", detail: "−0.152 %" }; dashes when missing.
 */
export function formatDriftLeading(driftPpm: number | null | undefined): { main: string; detail: string } {
  const d = formatDrift(driftPpm);
  const large = isNumber(driftPpm) && Math.abs(driftPpm) >= 10_000;
  return large ? { main: d.percent, detail: d.ppm } : { main: d.ppm, detail: d.percent };
}

/**
 * A signed capacitance in picofarads, for implied extra (stray) capacitance.
 *
 * @param capacitanceF - farads; positive means more capacitance than the design assumed.
 * @param decimals - default 1.
 * @returns e.g. 3.24e-12 → "+3.2 pF"; -1.4e-12 → "−1.4 pF".
 */
export function formatSignedPicofarads(capacitanceF: number | null | undefined, decimals = 1): string {
  if (!isNumber(capacitanceF)) return DASH;
  return `${fixed(capacitanceF * 1e12, decimals, true)} pF`;
}

/**
 * THD as the page shows it: percent and dB side by side.
 *
 * @param thdRatio - total harmonic distortion as an amplitude ratio (0.0123 for 1.23 %).
 * @returns e.g. 0.0123 → { percent: "1.23 %", db: "−38.2 dB" }.
 */
export function formatThd(thdRatio: number | null | undefined): { percent: string; db: string } {
  if (!isNumber(thdRatio) || thdRatio < 0) return { percent: DASH, db: DASH };
  const db = thdRatio === 0 ? DASH : formatDecibels(20 * Math.log10(thdRatio), "dB");
  return { percent: formatPercent(thdRatio * 100), db };
}

/**
 * A range of two values with one unit when both share a prefix.
 *
 * @returns e.g. 1.131e6, 1.219e6, "Hz", 5 → "1.1310 – 1.2190 MHz"; 998e3, 1.02e6 → "998.00 kHz – 1.0200 MHz".
 */
export function formatRange(
  min: number | null | undefined,
  max: number | null | undefined,
  unit: string,
  significantFigures = 4,
): string {
  if (!isNumber(min) || !isNumber(max)) return DASH;
  const a = formatQuantity(min, unit, significantFigures);
  const b = formatQuantity(max, unit, significantFigures);
  const split = (text: string) => {
    const at = text.lastIndexOf(" ");
    return at < 0 ? { number: text, unit: "" } : { number: text.slice(0, at), unit: text.slice(at + 1) };
  };
  const left = split(a);
  const right = split(b);
  return left.unit !== "" && left.unit === right.unit ? `${left.number} – ${b}` : `${a} – ${b}`;
}

/**
 * A signed capacitance for implied stray: picofarads with two decimals up to 1 nF, engineering notation above
 * (a drift of several percent implies nanofarads, and "+4727.94 pF" hides its size).
 *
 * @param capacitanceF - farads, signed.
 * @returns e.g. 3.24e-12 → "+3.24 pF"; -4.7279e-9 → "−4.728 nF".
 */
export function formatSignedCapacitance(capacitanceF: number | null | undefined): string {
  if (!isNumber(capacitanceF)) return DASH;
  if (Math.abs(capacitanceF) < 1e-9) return formatSignedPicofarads(capacitanceF, 2);
  return formatQuantity(capacitanceF, "F", 4, { signed: true });
}
