/**
 * A measured frequency's absolute 1σ: the capture's statistical uncertainty root-sum-squared with the scope's
 * timebase accuracy (± ppm, taken as 1σ: common practice for a data-sheet figure). Use it wherever a frequency is
 * compared with something outside the bench (a prediction, a target); two runs on the same scope share the
 * timebase error, so their difference needs the statistical figures only.
 *
 * @returns Hz; the statistical figure alone when the timebase is unknown; null when either input is missing
 */
export function absoluteUncertaintyHz(measuredHz: number | null, statisticalHz: number | null, timebasePpm: number | null | undefined): number | null {
  if (measuredHz === null || statisticalHz === null || !Number.isFinite(measuredHz) || !Number.isFinite(statisticalHz)) return null;
  if (timebasePpm === null || timebasePpm === undefined || !(timebasePpm > 0)) return statisticalHz;
  return Math.hypot(statisticalHz, (Math.abs(measuredHz) * timebasePpm) / 1e6);
}
