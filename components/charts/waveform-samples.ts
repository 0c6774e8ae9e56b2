/** A window of raw samples fetched for a deep zoom of the waveform. */
export interface WaveformExcerpt {
  fromS: number;
  toS: number;
  timeS: number[];
  volts: number[];
}

/** Fewest visible samples at which the envelope is still drawn; at or below it the chart fetches the samples. */
export const RAW_SAMPLES_THRESHOLD = 4000;

/**
 * Whether a zoom to `fromS`..`toS` is deep enough to draw samples instead of the envelope: the window holds at
 * most {@link RAW_SAMPLES_THRESHOLD} samples (the excerpt route's limit is above it) and is a real zoom.
 */
export function wantsRawSamples(fromS: number, toS: number, sampleRateHz: number | null | undefined): boolean {
  if (!sampleRateHz || !(sampleRateHz > 0) || !(toS > fromS)) return false;
  return (toS - fromS) * sampleRateHz <= RAW_SAMPLES_THRESHOLD;
}
