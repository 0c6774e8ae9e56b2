// Enough values to see a grid; more only costs the sort.
const PROBE_SAMPLES = 1 << 14;

/**
 * The record's code step, when its values sit on a uniform grid (an ADC's or the file's last
 * printed digit): the smallest gap between distinct values, accepted when every probed value lies
 * on the grid it spans and the grid has no more than 2^24 levels (a 24-bit record, or six printed decimals on a few volts) across the record.
 *
 * @param y - the record as captured (volts)
 * @returns the step in volts, or undefined when the values show no grid
 */
export function quantizationStepV(y: Float64Array): number | undefined {
  const n = y.length;
  if (n < 16) return undefined;
  const count = Math.min(n, PROBE_SAMPLES);
  const stride = n / count;
  const probe = new Float64Array(count);
  for (let i = 0; i < count; i++) probe[i] = y[Math.floor(i * stride)];
  probe.sort();
  let step = Infinity;
  for (let i = 1; i < count; i++) {
    const gap = probe[i] - probe[i - 1];
    if (gap > 0 && gap < step) step = gap;
  }
  const span = probe[count - 1] - probe[0];
  if (!Number.isFinite(step) || !(span > 0) || span / step > 1 << 24) return undefined;
  // Every value must be a whole number of steps from the lowest (within print round-off).
  for (let i = 0; i < count; i++) {
    const levels = (probe[i] - probe[0]) / step;
    if (Math.abs(levels - Math.round(levels)) > 0.02) return undefined;
  }
  return step;
}
