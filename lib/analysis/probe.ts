import type { Capture } from "./csv-import";

/**
 * Scales every voltage channel by a probe's attenuation, in place, for a capture whose file holds what the
 * scope saw at its input (the scope was not told about the probe): the circuit had `attenuation` times that.
 * Levels relative to the fundamental (dBc, THD) do not change; volts do.
 *
 * @param capture - an imported capture; its channels' samples are multiplied where they are
 * @param attenuation - the probe's factor, e.g. 10 for a 10:1 probe; 1 leaves the capture as it is
 * @returns the same capture
 * @throws RangeError when the attenuation is not a finite number of at least 1
 */
export function applyProbeAttenuation(capture: Capture, attenuation: number): Capture {
  if (!Number.isFinite(attenuation) || attenuation < 1) {
    throw new RangeError(`probe attenuation must be a finite number of at least 1, got ${attenuation}`);
  }
  if (attenuation === 1) return capture;
  for (const channel of capture.channels) {
    const samples = channel.samples;
    for (let i = 0; i < samples.length; i++) samples[i] *= attenuation;
  }
  return capture;
}
