/**
 * Seeded records with planted phase, frequency and timing noise of known level, for the
 * stability tests. Each returns the samples and the truth to compare with.
 */
import { fftPlan } from "../../lib/analysis/fft";
import { SeededRandom } from "../helpers/signals";

export const FS = 10e6;
export const F0 = 123_456.7;
export const N = 1 << 19;

/**
 * Gaussian phase noise with a flat one-sided density up to `bandHz` and none above, scaled to an
 * rms of `rmsRad`: S_φ = rms²/B, so 𝓛 = rms²/(2B) below B. White noise filtered by zeroing its DFT
 * bins above B (an ideal low-pass), so the planted spectrum is exact, not approximate.
 */
export function bandLimitedPhase(samples: number, sampleRateHz: number, bandHz: number, rmsRad: number, random: SeededRandom): Float64Array {
  const plan = fftPlan(samples);
  const data = plan.createComplexArray() as number[];
  for (let n = 0; n < samples; n++) data[2 * n] = random.normal();
  const spectrum = plan.createComplexArray() as number[];
  plan.transform(spectrum, data);
  const lastBin = Math.floor((bandHz * samples) / sampleRateHz);
  for (let k = 0; k < samples; k++) {
    const distance = Math.min(k, samples - k);
    if (distance === 0 || distance > lastBin) {
      spectrum[2 * k] = 0;
      spectrum[2 * k + 1] = 0;
    }
  }
  const back = plan.createComplexArray() as number[];
  plan.inverseTransform(back, spectrum);
  const out = new Float64Array(samples);
  let sumSquares = 0;
  for (let n = 0; n < samples; n++) {
    out[n] = back[2 * n];
    sumSquares += out[n] * out[n];
  }
  const scale = rmsRad / Math.sqrt(sumSquares / samples);
  for (let n = 0; n < samples; n++) out[n] *= scale;
  return out;
}

/** A random walk of the phase, σ rad per sample: white FM with σ_y(τ0) = σ/(2π f0 τ0), τ0 = 1/fs (REFERENCES.md, Allan deviation). */
export function randomWalkPhase(samples: number, stepRad: number, random: SeededRandom): Float64Array {
  const out = new Float64Array(samples);
  let p = 0;
  for (let n = 0; n < samples; n++) {
    p += stepRad * random.normal();
    out[n] = p;
  }
  return out;
}

/** A cos(2πf0 n/fs + φ0 + θ[n]) + white noise of σ per sample. */
export function toneWithPhase(phaseRad: Float64Array, noiseVrms: number, random: SeededRandom, amplitudeV = 1, f0 = F0, fs = FS): Float64Array {
  const y = new Float64Array(phaseRad.length);
  const w = (2 * Math.PI * f0) / fs;
  for (let n = 0; n < y.length; n++) y[n] = amplitudeV * Math.cos(w * n + 0.3 + phaseRad[n]) + noiseVrms * random.normal();
  return y;
}
