/**
 * A sample rate the one way Tankbook prints it: engineering prefix and "S/s" ("4.2 MS/s",
 * "500 kS/s", "1.25 GS/s"), up to four significant digits with trailing zeros dropped.
 */
export function formatSampleRate(sampleRateHz: number): string {
  if (!Number.isFinite(sampleRateHz)) return "—";
  const prefixes: [number, string][] = [
    [1e9, "G"],
    [1e6, "M"],
    [1e3, "k"],
    [1, ""],
  ];
  const [scale, prefix] = prefixes.find(([s]) => Math.abs(sampleRateHz) >= s) ?? [1, ""];
  const digits = Number((sampleRateHz / scale).toPrecision(4));
  return `${digits} ${prefix}S/s`;
}
