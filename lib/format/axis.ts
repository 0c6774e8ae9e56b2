/**
 * Chart axes in engineering units: one SI prefix for the whole axis (so ticks read 0, 50, 100 µs, not 0, 50 µs,
 * 0.1 ms), chosen from the largest magnitude on it.
 */
import { formatEngineering } from "@/lib/oscillator/units";
import { typographicMinus } from "./numbers";

export interface AxisUnit {
  /** Multiply SI values by this to get the axis's numbers. */
  factor: number;
  /** The prefixed unit for the axis label, e.g. "µs", "kHz", "mV". */
  unit: string;
}

/**
 * The prefix for an axis whose values reach `maxAbs`.
 *
 * @param maxAbs - largest |value| on the axis, SI units; 0 or non-finite gives no prefix.
 * @param unit - the base unit ("s", "Hz", "V").
 * @returns e.g. 2.3e-3, "V" → { factor: 1000, unit: "mV" }; 412e3, "Hz" → { factor: 0.001, unit: "kHz" }.
 */
export function axisUnit(maxAbs: number, unit: string): AxisUnit {
  if (!Number.isFinite(maxAbs) || maxAbs <= 0 || unit === "") return { factor: 1, unit };
  const exponent3 = Math.floor(Math.floor(Math.log10(maxAbs)) / 3) * 3;
  const text = formatEngineering(Number(`1e${exponent3}`), unit, 1);
  // Outside the prefix range the formatter falls back to exponent form: keep the base unit then.
  if (text.includes("e")) return { factor: 1, unit };
  return { factor: Number(`1e${-exponent3}`), unit: text.split(" ")[1] ?? unit };
}

/**
 * Tick labels for an axis in the given prefix, with just enough decimals for the tick spacing.
 *
 * @param splits - tick positions, SI units.
 * @param incrementSi - spacing between ticks, SI units.
 * @param axis - from {@link axisUnit}.
 * @returns one label per split, with U+2212 for negatives.
 */
export function axisTickLabels(splits: number[], incrementSi: number, axis: AxisUnit): string[] {
  const step = Math.abs(incrementSi * axis.factor);
  // The fewest decimals that write the step exactly (a 2.5 step needs one), so no two ticks round alike. A deep
  // zoom far from zero has a step many decades below the values (45.7786261 ms in steps of 0.1 ns), so the count
  // is not capped at a fixed few: it goes as far as a double holds digits, and further while two ticks still match.
  const write = (decimals: number) =>
    splits.map((v) => {
      const text = (v * axis.factor).toFixed(decimals);
      return typographicMinus(/^-0(\.0+)?$/.test(text) ? text.slice(1) : text);
    });
  let decimals = 0;
  if (step > 0 && Number.isFinite(step)) {
    const maxDecimals = Math.min(20, Math.max(0, 15 - Math.floor(Math.log10(step))));
    while (decimals < maxDecimals && Math.abs(step * 10 ** decimals - Math.round(step * 10 ** decimals)) > 1e-6 * 10 ** decimals * step) decimals++;
  }
  let labels = write(decimals);
  while (decimals < 20 && labels.some((label, i) => i > 0 && label === labels[i - 1])) labels = write(++decimals);
  return labels;
}
