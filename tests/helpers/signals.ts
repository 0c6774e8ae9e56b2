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

/**
 * An independent four-parameter least-squares sine fit (IEEE Std 1057 §4.1.3.3 defines the
 * estimator; this computes it a different way from the engine): for each trial frequency the
 * three linear parameters come from plain 3×3 normal equations by Cramer's rule, and the frequency
 * minimising the residual is found by a dense grid over [minCycles, maxCycles] periods per record
 * followed by golden-section search. Slow and simple on purpose.
 */
export function referenceSineFit(y: Float64Array, minCycles = 0.5, maxCycles = y.length / 2 - 1): { cyclesPerSample: number; amplitude: number } {
  const n = y.length;
  const residual = (cps: number) => {
    let cc = 0, cs = 0, ss = 0, c1 = 0, s1 = 0, yc = 0, ys = 0, y1 = 0, yy = 0;
    for (let i = 0; i < n; i++) {
      const c = Math.cos(2 * Math.PI * cps * i);
      const s = Math.sin(2 * Math.PI * cps * i);
      cc += c * c; cs += c * s; ss += s * s; c1 += c; s1 += s;
      yc += y[i] * c; ys += y[i] * s; y1 += y[i]; yy += y[i] * y[i];
    }
    const m = [[cc, cs, c1], [cs, ss, s1], [c1, s1, n]];
    const det3 = (a: number[][]) =>
      a[0][0] * (a[1][1] * a[2][2] - a[1][2] * a[2][1]) - a[0][1] * (a[1][0] * a[2][2] - a[1][2] * a[2][0]) + a[0][2] * (a[1][0] * a[2][1] - a[1][1] * a[2][0]);
    const d = det3(m);
    const rhs = [yc, ys, y1];
    const x = [0, 1, 2].map((col) => det3(m.map((row, r) => row.map((v, k) => (k === col ? rhs[r] : v)))) / d);
    return { rss: yy - (x[0] * yc + x[1] * ys + x[2] * y1), amplitude: Math.hypot(x[0], x[1]) };
  };
  const steps = Math.max(200, Math.ceil((maxCycles - minCycles) * 20));
  let best = minCycles;
  let bestRss = Infinity;
  for (let k = 0; k <= steps; k++) {
    const cycles = minCycles + ((maxCycles - minCycles) * k) / steps;
    const { rss } = residual(cycles / n);
    if (rss < bestRss) {
      bestRss = rss;
      best = cycles;
    }
  }
  const h = (maxCycles - minCycles) / steps;
  let lo = (best - h) / n;
  let hi = (best + h) / n;
  const phi = (Math.sqrt(5) - 1) / 2;
  for (let k = 0; k < 80; k++) {
    const a = hi - phi * (hi - lo);
    const b = lo + phi * (hi - lo);
    if (residual(a).rss < residual(b).rss) hi = b;
    else lo = a;
  }
  const cyclesPerSample = (lo + hi) / 2;
  return { cyclesPerSample, amplitude: residual(cyclesPerSample).amplitude };
}

/**
 * A tone under white FM: the phase is a random walk, φ[i+1] = φ[i] + 2π·f + σ_φ·w[i], the model
 * of an oscillator's white frequency noise (NIST SP 1065 §5 power-law noise, α = 0).
 */
export function whiteFmTone(samples: number, cyclesPerSample: number, amplitude: number, phaseStepStdRad: number, noiseStd: number, random: SeededRandom): Float64Array {
  const y = new Float64Array(samples);
  let phase = random.uniform() * 2 * Math.PI;
  for (let i = 0; i < samples; i++) {
    y[i] = amplitude * Math.cos(phase) + noiseStd * random.normal();
    phase += 2 * Math.PI * cyclesPerSample + phaseStepStdRad * random.normal();
  }
  return y;
}
