/**
 * Component values as people write them, and back.
 *
 * Accepted forms (see REFERENCES.md §5):
 * - SI: `4.7n`, `4.7 nF`, `470p`, `10u`, `10µH` (µ U+00B5 or μ U+03BC), `1.5 MHz`, `2.2k`, `1e-9`, `-3 pF`.
 * - a decimal comma as the CSV importer reads it: `4,7nF`, `1,5 MHz` (never `4,700`, which is ambiguous);
 * - IEC 60062 letter-and-digit (RKM) code: `4n7`, `2u2`, `R47`, `1k5`, `47K3`, `470R`, `p68`, `1µ0`, `4M7`, `5L6` (mΩ).
 * Deliberately refused:
 * - prefixes outside f…T (`4.7q` is quecto in SI, but no part is 10⁻³⁰ of anything: it is a typo);
 * - `E` as an RKM decimal point (`4E7` is read as 4×10⁷, scientific notation wins);
 * - a multiplier above 1 on farads or henries (`4.7M`, `10K` after a capacitor or inductor value is a tolerance
 *   letter, ±20 % / ±10 %, and `MF` is an old marking for microfarads), and R/L codes on anything but resistance.
 * Numbers are formatted with ASCII "-" and a normal space before the unit, so the text pastes into the CLI.
 */

export type QuantityUnit = "F" | "H" | "Hz" | "Ω";

/** Each quantity with its article, as it reads inside a message. */
const QUANTITY_NAME: Record<QuantityUnit, string> = {
  F: "a capacitance (F)",
  H: "an inductance (H)",
  Hz: "a frequency (Hz)",
  Ω: "a resistance (Ω)",
};

/** Decimal exponent of each accepted prefix. */
const PREFIX_EXPONENT: Record<string, number> = {
  f: -15,
  p: -12,
  n: -9,
  u: -6,
  "µ": -6,
  "μ": -6,
  m: -3,
  k: 3,
  // IEC 60062 writes kilo-ohms with a capital K (4K7, 47K3).
  K: 3,
  M: 6,
  G: 9,
  T: 12,
};

/** BOM exports often shout (`100NF`, `10UF`); only safe where no SI prefix of that letter could be meant. */
const UPPER_CASE_SMALL_PREFIX: Record<string, number> = { P: -12, N: -9, U: -6 };

/** RKM decimal-point letters that mean ×1 or ×10⁻³ and belong to resistance only. */
const RESISTANCE_ONLY_LETTER: Record<string, number> = { R: 0, L: -3 };

const UNIT_SUFFIXES: ReadonlyArray<[string, QuantityUnit]> = [
  ["ohms", "Ω"],
  ["ohm", "Ω"],
  ["Hz", "Hz"],
  ["Ω", "Ω"],
  ["\u2126", "Ω"],
  ["F", "F"],
  ["H", "H"],
];

const ACCEPTED_PREFIXES = "f, p, n, µ/u, m, k, M, G or T";

function notAValue(original: string, reason: string): RangeError {
  return new RangeError(`"${original}" is not a value: ${reason}`);
}

function normalise(text: string): string {
  return text
    .replace(/[\u00a0\u2009\u202f]/g, " ")
    .replace(/\u2212/g, "-")
    .trim();
}

/**
 * A decimal comma, as the CSV importer takes it ("4,7nF" is 4.7 nF): one comma between digits, no point. A comma
 * followed by exactly three digits ("4,700 pF") is refused, since it reads as 4700 to some and 4.7 to others.
 */
function decimalComma(original: string, s: string): string {
  if (!s.includes(",")) return s;
  const m = /^([+-]?\d*),(\d+)/.exec(s);
  if (!m || s.includes(".") || s.indexOf(",") !== s.lastIndexOf(",")) {
    throw notAValue(original, "a comma is read as the decimal mark, once, between digits (4,7n); write 4,7n or 4.7n");
  }
  if (m[2].length === 3 && m[1].replace(/^[+-]/, "") !== "" && m[1].replace(/^[+-]/, "") !== "0") {
    throw notAValue(original, `the comma could be a decimal mark or a thousands separator; write ${m[1]}.${m[2]} or ${m[1]}${m[2]}`);
  }
  return s.replace(",", ".");
}

/** Builds the double nearest the decimal digits × 10^exponent, without the rounding of 4.7 * 1e-9. */
function decimalToNumber(sign: string, intDigits: string, fracDigits: string, exponent: number): number {
  const digits = `${intDigits || "0"}.${fracDigits || "0"}`;
  const value = Number(`${digits}e${exponent}`);
  return sign === "-" ? -value : value;
}

function splitUnit(suffix: string): { rest: string; unit: QuantityUnit | undefined } {
  for (const [symbol, unit] of UNIT_SUFFIXES) {
    if (suffix.endsWith(symbol)) return { rest: suffix.slice(0, -symbol.length).trimEnd(), unit };
  }
  return { rest: suffix, unit: undefined };
}

function readLetter(
  original: string,
  letter: string,
  unit: QuantityUnit | undefined,
  allowResistanceLetters: boolean,
): number {
  if (letter === "") return 0;
  if (letter in PREFIX_EXPONENT) return PREFIX_EXPONENT[letter];
  if ((unit === "F" || unit === "H") && letter in UPPER_CASE_SMALL_PREFIX) return UPPER_CASE_SMALL_PREFIX[letter];
  if (allowResistanceLetters && letter in RESISTANCE_ONLY_LETTER) {
    if (unit === undefined || unit === "Ω") return RESISTANCE_ONLY_LETTER[letter];
    if (letter === "R" && unit === "H") {
      throw notAValue(
        original,
        "R as a decimal point is a resistance code (some inductor makers use 4R7 for 4.7 µH); write 4.7u or 4u7",
      );
    }
    throw notAValue(original, `the letter ${letter} marks a resistance, but ${QUANTITY_NAME[unit]} is wanted`);
  }
  throw notAValue(original, `unknown prefix or unit "${letter}" (use ${ACCEPTED_PREFIXES})`);
}

function checkUnits(original: string, found: QuantityUnit | undefined, expected: QuantityUnit | undefined): void {
  if (found !== undefined && expected !== undefined && found !== expected) {
    throw new RangeError(`"${original}" is ${QUANTITY_NAME[found]}; ${QUANTITY_NAME[expected]} is wanted here`);
  }
}

function checkPlausible(original: string, exponent: number, letter: string, unit: QuantityUnit | undefined): void {
  if ((unit === "F" || unit === "H") && exponent > 0) {
    const part = unit === "F" ? "a capacitor" : "an inductor";
    const reason =
      letter === "K" || letter === "M"
        ? `${letter} after ${part} value is the tolerance letter ±${letter === "K" ? 10 : 20} %, not a multiplier`
        : `${part} value with the multiplier ${letter} (10^${exponent}) is not a part value`;
    throw notAValue(original, `${reason}; write the prefix, e.g. 4.7n, 4u7 or 10m`);
  }
}

/**
 * Parses a component value or frequency written the way people write it.
 *
 * @param text - e.g. `"4n7"`, `"4.7 nF"`, `"10µH"`, `"412.3k"`, `"R47"`, `"1.5 MHz"`.
 * @param expectedUnit - the quantity wanted here (F, H, Hz or Ω); a value written with another unit is refused,
 *   and it decides readings that depend on the quantity (a trailing K or M on a capacitor is a tolerance letter).
 * @returns the value in SI base units (farads, henries, hertz, ohms).
 * @throws TypeError when `text` is not a string; RangeError naming the text and the rule it breaks otherwise.
 * @example parseValue("4n7", "F") // 4.7e-9
 */
export function parseValue(text: string, expectedUnit?: QuantityUnit): number {
  if (typeof text !== "string") throw new TypeError(`a value must be text; got ${typeof text}`);
  const original = text;
  const s = decimalComma(original, normalise(text));
  if (s === "") throw new RangeError("an empty text is not a value");

  // RKM: the letter sits where the decimal point goes, with digits after it (4n7, R47, p68, 47K3, 1µ0).
  const rkm = /^([+-]?)(\d*)([A-Za-zµμ])(\d+)\s*([A-Za-zΩ\u2126]*)$/.exec(s);
  if (rkm && !/^[eE]$/.test(rkm[3])) {
    const [, sign, intDigits, letter, fracDigits, unitText] = rkm;
    const { rest, unit: found } = splitUnit(unitText);
    if (rest !== "") throw notAValue(original, `unknown unit "${unitText}"`);
    checkUnits(original, found, expectedUnit);
    const unit = found ?? expectedUnit;
    // IEC 60062 also uses F as the decimal point for whole farads (1F5).
    const exponent = letter === "F" && (unit === undefined || unit === "F") ? 0 : readLetter(original, letter, unit, true);
    checkPlausible(original, exponent, letter, unit);
    return decimalToNumber(sign, intDigits, fracDigits, exponent);
  }

  const si = /^([+-]?)(?:(\d+)(?:\.(\d*))?|\.(\d+))(?:[eE]([+-]?\d+))?\s*(.*)$/.exec(s);
  if (!si) throw notAValue(original, "it does not start with a number");
  const [, sign, intDigits = "", fracA, fracB, exponentText, suffix] = si;
  const fracDigits = fracA ?? fracB ?? "";
  const { rest, unit: found } = splitUnit(suffix);
  checkUnits(original, found, expectedUnit);
  const unit = found ?? expectedUnit;
  if (rest.length > 1) throw notAValue(original, `unknown prefix or unit "${rest}" (use ${ACCEPTED_PREFIXES})`);
  // A bare trailing R is the RKM form of ohms (470R).
  const prefixExponent = readLetter(original, rest, unit, rest === "R" && found === undefined);
  checkPlausible(original, prefixExponent, rest, unit);
  const exponent = Number(exponentText ?? "0") + prefixExponent;
  const value = decimalToNumber(sign, intDigits, fracDigits, exponent);
  if (!Number.isFinite(value)) throw notAValue(original, "it is too large to represent");
  return value;
}

const FORMAT_PREFIX: Record<number, string> = {
  [-15]: "f",
  [-12]: "p",
  [-9]: "n",
  [-6]: "µ",
  [-3]: "m",
  0: "",
  3: "k",
  6: "M",
  9: "G",
  12: "T",
};

export interface FormatOptions {
  /** Drop trailing zeros after the decimal point ("4.7 nF" rather than "4.700 nF"). Default false. */
  trimZeros?: boolean;
}

/**
 * Formats a value in engineering notation: mantissa 1 ≤ |m| < 1000 and an SI prefix.
 *
 * @param value - the value in SI base units.
 * @param unit - the unit symbol to append (e.g. "Hz", "F", "H", "Ω"; "" for none).
 * @param significantFigures - 1 to 15; default 4.
 * @returns e.g. `formatEngineering(412307, "Hz", 6)` → `"412.307 kHz"`. Values outside the f…T prefixes (and
 *   multiples above 1 for F and H, which {@link parseValue} refuses) use exponent form, `"1.00e3 F"`.
 * @throws RangeError when `value` is not finite or `significantFigures` is not an integer from 1 to 15.
 */
export function formatEngineering(
  value: number,
  unit: string,
  significantFigures = 4,
  options: FormatOptions = {},
): string {
  if (!Number.isFinite(value)) throw new RangeError(`only finite numbers can be formatted; got ${value}`);
  if (!Number.isInteger(significantFigures) || significantFigures < 1 || significantFigures > 15) {
    throw new RangeError(`significant figures must be an integer from 1 to 15; got ${significantFigures}`);
  }
  const join = (number: string, prefix: string): string =>
    unit === "" ? `${number}${prefix}` : `${number} ${prefix}${unit}`;
  if (value === 0) return join("0", "");

  const sign = value < 0 ? "-" : "";
  const [mantissa, exponentText] = Math.abs(value).toExponential(significantFigures - 1).split("e");
  const exponent = Number(exponentText);
  const exponent3 = Math.floor(exponent / 3) * 3;
  const digits = mantissa.replace(".", "");
  const integerLength = exponent - exponent3 + 1;
  const padded = digits.padEnd(integerLength, "0");
  let number = padded.slice(0, integerLength);
  const fraction = padded.slice(integerLength);
  if (fraction !== "") number += `.${fraction}`;
  if (options.trimZeros && number.includes(".")) number = number.replace(/\.?0+$/, "");

  const bigForPart = (unit === "F" || unit === "H") && exponent3 > 0;
  if (!(exponent3 in FORMAT_PREFIX) || bigForPart) {
    let exponentMantissa = mantissa;
    if (options.trimZeros && exponentMantissa.includes(".")) exponentMantissa = exponentMantissa.replace(/\.?0+$/, "");
    return join(`${sign}${exponentMantissa}e${exponent}`, "");
  }
  return join(`${sign}${number}`, FORMAT_PREFIX[exponent3]);
}

/** IEC 60062 / EIA tolerance letters as seen in REFERENCES.md §5. */
const TOLERANCE_LETTER: Record<string, number> = { F: 0.01, G: 0.02, J: 0.05, K: 0.1, M: 0.2 };

/**
 * Parses a symmetric part tolerance.
 *
 * @param text - `"5%"`, `"±5 %"`, `"+/-5%"`, `"50ppm"`, or a letter F (±1 %), G (±2 %), J (±5 %), K (±10 %), M (±20 %).
 *   B, C and D are refused: on small capacitors they are absolute (±0.1/0.25/0.5 pF), not a percentage.
 * @returns the tolerance as a fraction (0.05 for 5 %), from 0 to below 1.
 * @throws RangeError naming the text when it is not a symmetric tolerance below 100 %.
 */
export function parseTolerance(text: string): number {
  if (typeof text !== "string") throw new TypeError(`a tolerance must be text; got ${typeof text}`);
  const s = normalise(text).replace(/(\d),(\d)/, "$1.$2");
  if (s in TOLERANCE_LETTER) return TOLERANCE_LETTER[s];
  if (/^[BCD]$/.test(s)) {
    throw new RangeError(`"${text}" is not a tolerance Tankbook reads: on small capacitors ${s} is an absolute pF tolerance; write it in % instead`);
  }
  if (/[+-]\s*\d.*\/\s*[+-]/.test(s)) {
    throw new RangeError(`"${text}" is an asymmetric tolerance; only symmetric ones (±x %) are supported`);
  }
  const m = /^(?:±|\+\/-|\+-)?\s*(\d+(?:\.\d*)?|\.\d+)\s*(%|ppm)$/.exec(s);
  if (!m) throw new RangeError(`"${text}" is not a tolerance: write it like 5%, ±5 %, 50ppm or a letter F, G, J, K, M`);
  const fraction = Number(`${m[1]}e${m[2] === "%" ? -2 : -6}`);
  if (!(fraction < 1)) throw new RangeError(`"${text}" is not a tolerance: it must be below 100 %`);
  return fraction;
}

export interface Tempco {
  /** Nominal temperature coefficient in ppm/K (ppm/°C is the same size); negative for N750-type parts. */
  ppmPerK: number;
  /** Half-width of the tolerance on the coefficient in ppm/K (30 for C0G's 0 ± 30 ppm/°C). */
  spreadPpmPerK: number;
}

/**
 * Parses a temperature coefficient.
 *
 * @param text - `"±30ppm/°C"`, `"-750ppm/K"`, `"-750 ± 250 ppm/°C"`, `"+100 ppm/degC"`, the EIA class 1 codes
 *   `N750` / `P100`, or `C0G` / `NP0` (0 ± 30 ppm/°C, REFERENCES.md §8).
 * @returns nominal coefficient and spread, both in ppm/K.
 * @throws RangeError naming the text when it matches none of these.
 */
export function parseTempco(text: string): Tempco {
  if (typeof text !== "string") throw new TypeError(`a tempco must be text; got ${typeof text}`);
  const s = normalise(text).replace(/\+\/-/g, "±");
  if (/^(C0G|COG|NP0|NPO)$/i.test(s)) return { ppmPerK: 0, spreadPpmPerK: 30 };
  const code = /^([NP])(\d+)$/.exec(s);
  if (code) return { ppmPerK: (code[1] === "N" ? -1 : 1) * Number(code[2]), spreadPpmPerK: 0 };
  const m = /^([+-]?\d+(?:\.\d+)?)?\s*(?:±\s*(\d+(?:\.\d+)?))?\s*ppm\s*\/\s*(?:[°º]\s*C|deg\s*C|C|K)$/.exec(s);
  if (!m || (m[1] === undefined && m[2] === undefined)) {
    throw new RangeError(`"${text}" is not a tempco: write it like ±30ppm/°C, -750ppm/K, N750 or C0G`);
  }
  return { ppmPerK: Number(m[1] ?? "0"), spreadPpmPerK: Number(m[2] ?? "0") };
}
