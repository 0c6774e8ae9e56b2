/**
 * Synthetic signals with known truth for the analysis tests. Seeded; no I/O.
 * Capture-shaped signals (CSV text, second channel, envelopes) come from scripts/lib/synth-capture.
 */
import { SeededRandom } from "../../scripts/lib/synth-capture";

export { SeededRandom, synthCaptureCsv, synthSamples } from "../../scripts/lib/synth-capture";
export type { SynthCaptureOptions } from "../../scripts/lib/synth-capture";

/** Fourier amplitude laws of the ideal ±1 waves, V_n/V_1 (REFERENCES.md §2, T. Smyth, UCSD). */
export type WaveShape = "square" | "triangle" | "sawtooth";

/** Relative amplitude and sign of harmonic n of a wave (0 when the wave has no such harmonic). */
export function harmonicLaw(shape: WaveShape, n: number): number {
  switch (shape) {
    case "square":
      return n % 2 === 1 ? 1 / n : 0;
    case "triangle":
      return n % 2 === 1 ? (((n - 1) / 2) % 2 === 0 ? 1 : -1) / (n * n) : 0;
    case "sawtooth":
      return (n % 2 === 1 ? 1 : -1) / n;
  }
}

/** THD_F of a wave band-limited to orders ≤ maxOrder, from its amplitude law: √(Σ_{n=2..H} a_n²)/a_1. */
export function bandLimitedThd(shape: WaveShape, maxOrder: number): number {
  let sum = 0;
  for (let n = 2; n <= maxOrder; n++) sum += harmonicLaw(shape, n) ** 2;
  return Math.sqrt(sum);
}

/**
 * A wave band-limited to orders ≤ maxOrder (so nothing aliases), fundamental amplitude `amplitude`.
 * @param cyclesPerSample - f/fs
 */
export function bandLimitedWave(
  shape: WaveShape,
  samples: number,
  cyclesPerSample: number,
  maxOrder: number,
  amplitude = 1,
  phaseRad = 0.4,
): Float64Array {
  const y = new Float64Array(samples);
  for (let n = 1; n <= maxOrder; n++) {
    const a = harmonicLaw(shape, n) * amplitude;
    if (a === 0) continue;
    for (let i = 0; i < samples; i++) y[i] += a * Math.sin(2 * Math.PI * n * cyclesPerSample * i + n * phaseRad);
  }
  return y;
}

/** A real tone A·cos(2πf·n + φ) + dc, plus white Gaussian noise of standard deviation noiseStd. */
export function noisyTone(
  samples: number,
  cyclesPerSample: number,
  amplitude: number,
  phaseRad: number,
  noiseStd: number,
  random: SeededRandom,
  dc = 0,
): Float64Array {
  const y = new Float64Array(samples);
  for (let i = 0; i < samples; i++) {
    y[i] = dc + amplitude * Math.cos(2 * Math.PI * cyclesPerSample * i + phaseRad) + noiseStd * random.normal();
  }
  return y;
}

/**
 * Cramér–Rao bound on the standard deviation of a frequency estimate of a real tone in white
 * Gaussian noise (Rife & Boorstyn 1974; REFERENCES.md §4):
 * var(f̂) ≥ 12·fs² / ((2π)²·η·N·(N²−1)), η = A²/(2σ²).
 */
export function cramerRaoFrequencyStdHz(sampleRateHz: number, samples: number, snrLinear: number): number {
  const n = samples;
  return Math.sqrt((12 * sampleRateHz ** 2) / ((2 * Math.PI) ** 2 * snrLinear * n * (n * n - 1)));
}

/** Direct O(N²) DFT of a real sequence, X[k] = Σ x[n]·e^(−2πikn/N), as interleaved re/im. */
export function directDft(x: Float64Array): Float64Array {
  const n = x.length;
  const out = new Float64Array(2 * n);
  for (let k = 0; k < n; k++) {
    let re = 0;
    let im = 0;
    for (let i = 0; i < n; i++) {
      const angle = (-2 * Math.PI * ((k * i) % n)) / n;
      re += x[i] * Math.cos(angle);
      im += x[i] * Math.sin(angle);
    }
    out[2 * k] = re;
    out[2 * k + 1] = im;
  }
  return out;
}
