import { formatQuantity, MINUS } from "@/lib/format/numbers";

const NAMES: Record<string, string> = {
  frequency: "Frequency",
  thd: "THD",
  amplitude: "Fundamental amplitude",
  "in-record-drift": "Drift within the record",
  "rms-jitter": "rms jitter",
  "phase-noise": "Phase noise",
  "start-up": "Start-up time",
  pushing: "Pushing (across runs)",
  tempco: "Temperature coefficient (across runs)",
};

/**
 * A spec rule id in words for the flag list and the report: "harmonic-3" → "Harmonic 3",
 * "warning-not-steady" → "Trust: not steady".
 */
export function ruleName(rule: string): string {
  if (NAMES[rule]) return NAMES[rule];
  const harmonic = /^harmonic-(\d+)$/.exec(rule);
  if (harmonic) return `Harmonic ${harmonic[1]}`;
  const warning = /^warning-(.+)$/.exec(rule);
  if (warning) return `Trust: ${warning[1].replace(/-/g, " ")}`;
  return rule.replace(/-/g, " ");
}

function digitsFor(unit: string): number {
  return unit === "ppm" ? 0 : unit === "V" ? 3 : unit === "%" ? 2 : 1;
}

/**
 * A flag's measured value, limit or margin with its unit, the typographic minus, and a margin in dB when the
 * rule is in dBc (a difference of two levels).
 *
 * @param value - the number, or null for a trust warning (shows "—").
 * @param unit - the flag's unit ("%", "ppm", "dBc", "V" or "").
 * @param margin - format as a margin (dBc becomes dB, always signed).
 */
export function flagFigure(value: number | null, unit: string, margin = false): string {
  if (value === null || !Number.isFinite(value)) return "\u2014";
  // Jitter and start-up times span picoseconds to milliseconds: engineering notation, not fixed decimals.
  if (unit === "s") return formatQuantity(value, "s", 3, { signed: margin });
  const shownUnit = margin && unit === "dBc" ? "dB" : unit;
  const text = Math.abs(value).toFixed(digitsFor(unit));
  const sign = value < 0 && Number(text) !== 0 ? MINUS : margin && value > 0 ? "+" : "";
  return `${sign}${text}${shownUnit ? ` ${shownUnit}` : ""}`;
}
