import { formatEngineering } from "../oscillator/units";

/**
 * A sample rate the one way Tankbook prints it: engineering prefix and "S/s" ("4.2 MS/s", "500 kS/s",
 * "1.25 GS/s"), up to four significant digits with trailing zeros dropped; "—" when there is no finite rate.
 */
export function formatSampleRate(sampleRateHz: number): string {
  return Number.isFinite(sampleRateHz) ? formatEngineering(sampleRateHz, "S/s", 4, { trimZeros: true }) : "—";
}
