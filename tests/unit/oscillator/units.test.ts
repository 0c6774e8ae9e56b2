import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { formatEngineering, parseTempco, parseTolerance, parseValue, type QuantityUnit } from "@/lib/oscillator";

describe("parseValue", () => {
  it("reads SI prefixes with and without a unit", () => {
    expect(parseValue("4.7n")).toBe(4.7e-9);
    expect(parseValue("4.7 nF", "F")).toBe(4.7e-9);
    expect(parseValue("470p", "F")).toBe(4.7e-10);
    expect(parseValue("10u", "H")).toBe(1e-5);
    expect(parseValue("2.2k")).toBe(2200);
    expect(parseValue("412.3k", "Hz")).toBe(412300);
    expect(parseValue("1.5 MHz", "Hz")).toBe(1.5e6);
    expect(parseValue("1e-9", "F")).toBe(1e-9);
    expect(parseValue(".5n", "F")).toBe(5e-10);
  });

  it("reads both micro signs and u", () => {
    // REFERENCES.md §5: accept µ U+00B5 and μ U+03BC.
    expect(parseValue("10\u00b5H", "H")).toBe(1e-5);
    expect(parseValue("10\u03bcH", "H")).toBe(1e-5);
    expect(parseValue("10uH", "H")).toBe(1e-5);
  });

  it("reads the IEC 60062 letter-and-digit code", () => {
    // REFERENCES.md §5, IEC 60062:2016 RKM examples (Wikipedia "RKM code" mirrors) and the listed parse tests.
    expect(parseValue("4n7")).toBe(4.7e-9);
    expect(parseValue("R47")).toBe(0.47);
    expect(parseValue("2k2")).toBe(2200); // lower-case k: common practice
    expect(parseValue("47K3")).toBe(47300);
    expect(parseValue("470R")).toBe(470);
    expect(parseValue("4R7", "Ω")).toBe(4.7);
    expect(parseValue("4K7", "Ω")).toBe(4700);
    expect(parseValue("4M7", "Ω")).toBe(4.7e6);
    expect(parseValue("1u0")).toBe(1e-6);
    expect(parseValue("1\u00b50", "F")).toBe(1e-6);
    expect(parseValue("p68")).toBe(6.8e-13); // pattern from memory, REFERENCES.md §5
    expect(parseValue("2u2", "H")).toBe(2.2e-6);
    expect(parseValue("1k5")).toBe(1500);
    expect(parseValue("10p", "F")).toBe(1e-11);
    expect(parseValue("5L6", "Ω")).toBe(5.6e-3); // L = milliohm, REFERENCES.md §5
  });

  it("accepts shouted BOM prefixes only on capacitors and inductors", () => {
    expect(parseValue("100NF", "F")).toBe(1e-7);
    expect(parseValue("10UH", "H")).toBe(1e-5);
    expect(() => parseValue("100N", "Hz")).toThrow(RangeError);
  });

  it("refuses a value written in another unit", () => {
    expect(() => parseValue("4.7 nH", "F")).toThrow(/"4.7 nH" is an inductance \(H\); a capacitance \(F\) is wanted here/);
    expect(() => parseValue("1 MHz", "F")).toThrow(/is a frequency/);
  });

  it("refuses nonsense with the text in the message", () => {
    expect(() => parseValue("4.7q")).toThrow(/^"4.7q" is not a value/);
    expect(() => parseValue("abc")).toThrow(/"abc" is not a value/);
    expect(() => parseValue("")).toThrow(RangeError);
    expect(() => parseValue("1.2.3")).toThrow(RangeError);
    expect(() => parseValue("4n7n")).toThrow(RangeError);
    expect(() => parseValue("1mhz", "Hz")).toThrow(/"1mhz" is not a value/);
    expect(() => parseValue(4.7 as unknown as string)).toThrow(TypeError);
  });

  it("reads a K or M after a capacitor or inductor value as the tolerance-letter trap", () => {
    // REFERENCES.md §5 trap: K or M after the digits may be a tolerance (K ±10 %, M ±20 %).
    expect(() => parseValue("4.7M", "F")).toThrow(/M after a capacitor value is the tolerance letter ±20 %/);
    expect(() => parseValue("10K", "H")).toThrow(/K after an inductor value is the tolerance letter ±10 %/);
    expect(() => parseValue("2.2kF")).toThrow(RangeError);
  });

  it("refuses resistance letters for other quantities", () => {
    // REFERENCES.md §5: some inductor makers mark 4R7 for 4.7 µH, non-standard; refuse rather than read 4.7 H.
    expect(() => parseValue("4R7", "H")).toThrow(/4\.7u or 4u7/);
    expect(() => parseValue("470R", "F")).toThrow(RangeError);
  });

  it("reads E as an exponent, not an RKM decimal point", () => {
    expect(parseValue("4E7")).toBe(4e7);
  });

  it("keeps signs, including the Unicode minus", () => {
    expect(parseValue("-3 pF", "F")).toBe(-3e-12);
    expect(parseValue("\u22123p", "F")).toBe(-3e-12);
  });
});

describe("formatEngineering", () => {
  it("formats with the chosen significant figures", () => {
    expect(formatEngineering(412307, "Hz", 6)).toBe("412.307 kHz");
    expect(formatEngineering(4.7e-9, "F", 3)).toBe("4.70 nF");
    expect(formatEngineering(4.7e-9, "F", 4, { trimZeros: true })).toBe("4.7 nF");
    expect(formatEngineering(0.5, "H", 1)).toBe("500 mH");
    expect(formatEngineering(2200, "Ω", 2)).toBe("2.2 kΩ");
    expect(formatEngineering(1e-5, "H", 3)).toBe("10.0 µH");
  });

  it("carries a rounding into the next prefix", () => {
    expect(formatEngineering(999.96, "Hz", 4)).toBe("1.000 kHz");
  });

  it("uses an ASCII minus and exponent form outside the prefixes", () => {
    expect(formatEngineering(-2.13e-12, "F", 3)).toBe("-2.13 pF");
    expect(formatEngineering(1e-20, "F", 3)).toBe("1.00e-20 F");
    expect(formatEngineering(1500, "F", 2)).toBe("1.5e3 F");
    expect(formatEngineering(0, "Hz")).toBe("0 Hz");
    expect(formatEngineering(2200, "", 2)).toBe("2.2k");
  });

  it("refuses non-finite values and bad figures", () => {
    expect(() => formatEngineering(Number.NaN, "Hz")).toThrow(RangeError);
    expect(() => formatEngineering(1, "Hz", 0)).toThrow(/significant figures/);
  });

  it("round-trips through parseValue to the formatted precision", () => {
    const units: (QuantityUnit | "")[] = ["Hz", "F", "H", "Ω", ""];
    fc.assert(
      fc.property(
        fc.double({ min: 1e-18, max: 1e14, noNaN: true }),
        fc.boolean(),
        fc.integer({ min: 1, max: 12 }),
        fc.constantFrom(...units),
        fc.boolean(),
        (magnitude, negative, figures, unit, trimZeros) => {
          const value = negative ? -magnitude : magnitude;
          const text = formatEngineering(value, unit, figures, { trimZeros });
          const parsed = parseValue(text, unit === "" ? undefined : unit);
          // The text holds exactly the digits of toExponential, so the parse is the same decimal number.
          expect(parsed).toBe(Number(value.toExponential(figures - 1)));
        },
      ),
      { seed: 4, numRuns: 2000 },
    );
  });
});

describe("parseTolerance", () => {
  it("reads percent, ppm and symmetric signs", () => {
    expect(parseTolerance("5%")).toBe(0.05);
    expect(parseTolerance("±5 %")).toBe(0.05);
    expect(parseTolerance("+/-10%")).toBe(0.1);
    expect(parseTolerance("50ppm")).toBe(5e-5);
    expect(parseTolerance("0.5 %")).toBe(0.005);
  });

  it("reads the tolerance letters", () => {
    // REFERENCES.md §5: F ±1 %, G ±2 %, J ±5 %, K ±10 %, M ±20 % (EIA list).
    expect(parseTolerance("F")).toBe(0.01);
    expect(parseTolerance("G")).toBe(0.02);
    expect(parseTolerance("J")).toBe(0.05);
    expect(parseTolerance("K")).toBe(0.1);
    expect(parseTolerance("M")).toBe(0.2);
  });

  it("refuses bare numbers, absolute letters, asymmetric and 100 % or more", () => {
    expect(() => parseTolerance("5")).toThrow(/write it like 5%/);
    expect(() => parseTolerance("C")).toThrow(/absolute pF/);
    expect(() => parseTolerance("+80/-20%")).toThrow(/asymmetric/);
    expect(() => parseTolerance("100%")).toThrow(/below 100 %/);
  });
});

describe("parseTempco", () => {
  it("reads signed and spread coefficients in ppm/°C and ppm/K", () => {
    expect(parseTempco("±30ppm/°C")).toEqual({ ppmPerK: 0, spreadPpmPerK: 30 });
    expect(parseTempco("-750ppm/K")).toEqual({ ppmPerK: -750, spreadPpmPerK: 0 });
    expect(parseTempco("-750 ± 250 ppm/°C")).toEqual({ ppmPerK: -750, spreadPpmPerK: 250 });
    expect(parseTempco("+100 ppm/degC")).toEqual({ ppmPerK: 100, spreadPpmPerK: 0 });
  });

  it("reads class 1 codes", () => {
    // REFERENCES.md §8: C0G/NP0 is 0 ± 30 ppm/°C (TDK FAQ capacitors-0051).
    expect(parseTempco("C0G")).toEqual({ ppmPerK: 0, spreadPpmPerK: 30 });
    expect(parseTempco("NP0")).toEqual({ ppmPerK: 0, spreadPpmPerK: 30 });
    expect(parseTempco("N750")).toEqual({ ppmPerK: -750, spreadPpmPerK: 0 });
  });

  it("refuses anything else", () => {
    expect(() => parseTempco("30")).toThrow(/is not a tempco/);
    expect(() => parseTempco("ppm/K")).toThrow(/is not a tempco/);
  });
});
