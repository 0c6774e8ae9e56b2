/**
 * How far part tolerances can move f0: the worst case over every tolerance corner, a seeded Monte Carlo band,
 * and a linear root-sum-square band.
 */

import { assertValidDesign, nominalValues, parallelCapacitanceF, type OscillatorDesign } from "./design";
import { frequencyFromValues } from "./topologies";

export interface FrequencyBand {
  minHz: number;
  maxHz: number;
}

export interface WorstCaseBand extends FrequencyBand {
  /** Number of tolerance corners evaluated (2^parts with a tolerance). */
  corners: number;
  /** Part values at the lowest-frequency corner, SI units. */
  minCorner: Record<string, number>;
  /** Part values at the highest-frequency corner, SI units. */
  maxCorner: Record<string, number>;
  /**
   * Corners where the model has no tank at all (a Hartley with opposing windings whose L1 + L2 − 2M reaches 0, or
   * a calibration that leaves C_eff at or below 0). They are left out of min and max, so the band is then only
   * over the corners that exist; 0 when every corner is a tank.
   */
  invalidCorners: number;
  /** The model's reason at the first such corner, null when there is none. */
  invalidReason: string | null;
}

/** f0 at one set of values, or the model's reason why those values are no tank. */
function tryFrequency(design: OscillatorDesign, values: Record<string, number>): { hz: number } | { reason: string } {
  try {
    const hz = frequencyOf(design, values);
    return Number.isFinite(hz) ? { hz } : { reason: `f0 is not finite (${hz})` };
  } catch (error) {
    if (!(error instanceof RangeError)) throw error;
    return { reason: error.message };
  }
}

/** A sentence for a band that had to leave corners out: what happened, for the page and the command. */
export function invalidCornersText(band: Pick<WorstCaseBand, "invalidCorners" | "corners" | "invalidReason">): string | null {
  if (band.invalidCorners === 0) return null;
  return (
    `${band.invalidCorners} of ${band.corners} tolerance corners make the model invalid (${band.invalidReason}); ` +
    "the bands cover only the corners that are a tank, so parts near those corners may not oscillate as modelled"
  );
}

function frequencyOf(design: OscillatorDesign, values: Record<string, number>): number {
  return frequencyFromValues(design.topology, values, parallelCapacitanceF(design), design.windings);
}

function tolerancedRefs(design: OscillatorDesign): string[] {
  return Object.entries(design.parts)
    .filter(([, part]) => (part.tolerance ?? 0) > 0)
    .map(([ref]) => ref);
}

/**
 * The extremes of f0 over every combination of parts at +tolerance or −tolerance. Every topology here has f0
 * monotonic in each part, so the corners hold the true extremes.
 *
 * @param design - validated first; parts without a tolerance stay at nominal.
 * @returns min and max f0 in Hz with the corner values that give them.
 * @throws RangeError when the design is invalid.
 */
export function worstCaseBand(design: OscillatorDesign): WorstCaseBand {
  assertValidDesign(design);
  const nominal = nominalValues(design);
  const refs = tolerancedRefs(design);
  const nominalHz = frequencyOf(design, nominal);
  const band: WorstCaseBand = {
    minHz: nominalHz,
    maxHz: nominalHz,
    corners: 2 ** refs.length,
    minCorner: { ...nominal },
    maxCorner: { ...nominal },
    invalidCorners: 0,
    invalidReason: null,
  };
  for (let mask = 0; mask < band.corners; mask++) {
    const values = { ...nominal };
    refs.forEach((ref, i) => {
      const t = design.parts[ref].tolerance as number;
      values[ref] = nominal[ref] * (mask & (1 << i) ? 1 + t : 1 - t);
    });
    const result = tryFrequency(design, values);
    if ("reason" in result) {
      band.invalidCorners++;
      band.invalidReason ??= result.reason;
      continue;
    }
    const f = result.hz;
    if (f < band.minHz) {
      band.minHz = f;
      band.minCorner = values;
    }
    if (f > band.maxHz) {
      band.maxHz = f;
      band.maxCorner = values;
    }
  }
  return band;
}

/**
 * Logarithmic sensitivity S = ∂ln f0/∂ln x of f0 to each part (−½ for both L and C of a plain tank), by central
 * difference with a relative step of 1e-5 (error of order 1e-10).
 *
 * @param design - validated first.
 * @returns S by part reference (dimensionless).
 * @throws RangeError when the design is invalid.
 */
export function frequencySensitivities(design: OscillatorDesign): Record<string, number> {
  assertValidDesign(design);
  const nominal = nominalValues(design);
  const h = 1e-5;
  const out: Record<string, number> = {};
  for (const ref of Object.keys(nominal)) {
    const up = frequencyOf(design, { ...nominal, [ref]: nominal[ref] * (1 + h) });
    const down = frequencyOf(design, { ...nominal, [ref]: nominal[ref] * (1 - h) });
    out[ref] = Math.log(up / down) / Math.log((1 + h) / (1 - h));
  }
  return out;
}

export interface RssBand extends FrequencyBand {
  /** One standard deviation of f0 as a fraction of nominal. */
  relativeSigma: number;
  /** How many sigmas wide each side of the band is. */
  sigmas: number;
  /**
   * False when the linear band reaches 0 Hz or below: the tolerances are too wide for a first-order estimate, and
   * only the worst-case and Monte Carlo bands mean anything.
   */
  meaningful: boolean;
}

/**
 * Linear root-sum-square band: each tolerance is taken as a 3σ limit, σ_f/f = √Σ(S_i·t_i/3)², and the band is
 * nominal·(1 ± sigmas·σ_f/f). Good for small tolerances; the Monte Carlo band also captures the curvature.
 *
 * @param design - validated first.
 * @param sigmas - half-width of the band in standard deviations; default 3 (≈99.7 % for a normal spread).
 * @throws RangeError when the design is invalid or `sigmas` is not above 0.
 */
export function rssBand(design: OscillatorDesign, sigmas = 3): RssBand {
  if (!(Number.isFinite(sigmas) && sigmas > 0)) throw new RangeError(`sigmas must be above 0; got ${sigmas}`);
  const sensitivities = frequencySensitivities(design);
  const nominalHz = frequencyOf(design, nominalValues(design));
  let sumSquares = 0;
  for (const [ref, part] of Object.entries(design.parts)) {
    sumSquares += (sensitivities[ref] * ((part.tolerance ?? 0) / 3)) ** 2;
  }
  const relativeSigma = Math.sqrt(sumSquares);
  const minHz = nominalHz * (1 - sigmas * relativeSigma);
  return {
    minHz,
    maxHz: nominalHz * (1 + sigmas * relativeSigma),
    relativeSigma,
    sigmas,
    meaningful: minHz > 0,
  };
}

/** mulberry32: a small, fast 32-bit generator; the same seed always gives the same sequence. */
export function seededRandom(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function standardNormal(random: () => number): number {
  // Box–Muller; 1 − u keeps the logarithm's argument above 0.
  const u = 1 - random();
  const v = random();
  return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
}

function percentile(sorted: Float64Array, p: number): number {
  const position = p * (sorted.length - 1);
  const lo = Math.floor(position);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (position - lo);
}

/** Most simulated builds one call may ask for. */
export const MAX_TRIALS = 1_000_000;

export interface StatisticalOptions {
  /** Generator seed; default 1. The same seed and design always give the same band. */
  seed?: number;
  /** Number of simulated builds; default 20 000. */
  trials?: number;
  /** Central fraction of builds the band covers; default 0.997 (the ±3σ share of a normal spread). */
  coverage?: number;
}

export interface StatisticalBand extends FrequencyBand {
  method: "monte-carlo";
  seed: number;
  trials: number;
  coverage: number;
  meanHz: number;
  stdDevHz: number;
  /** Simulated builds the model could not evaluate (no tank at those values); left out of the band. */
  invalidTrials: number;
}

/**
 * Monte Carlo band: each part is drawn from a normal distribution with σ = tolerance/3, truncated at ±tolerance
 * (parts outside their tolerance are rejected at the factory — a common modelling practice), and the band is the
 * central `coverage` share of the simulated f0 values (0.15th to 99.85th percentile by default).
 *
 * @param design - validated first.
 * @param options - seed, trials and coverage.
 * @returns band in Hz with mean and standard deviation of the simulated f0.
 * @throws RangeError when the design is invalid, trials is not an integer from 100 to {@link MAX_TRIALS}, or coverage is not
 *   strictly between 0 and 1.
 */
export function statisticalBand(design: OscillatorDesign, options: StatisticalOptions = {}): StatisticalBand {
  assertValidDesign(design);
  const seed = options.seed ?? 1;
  const trials = options.trials ?? 20_000;
  const coverage = options.coverage ?? 0.997;
  // The upper limit keeps one request from tying up a server for minutes.
  if (!Number.isInteger(trials) || trials < 100 || trials > MAX_TRIALS) {
    throw new RangeError(`trials must be an integer from 100 to ${MAX_TRIALS}; got ${trials}`);
  }
  if (!(coverage > 0 && coverage < 1)) throw new RangeError(`coverage must be between 0 and 1; got ${coverage}`);
  if (!Number.isFinite(seed)) throw new RangeError(`seed must be a finite number; got ${seed}`);

  const random = seededRandom(seed);
  const nominal = nominalValues(design);
  const refs = tolerancedRefs(design);
  const drawn = new Float64Array(trials);
  let valid = 0;
  let sum = 0;
  for (let i = 0; i < trials; i++) {
    const values = { ...nominal };
    for (const ref of refs) {
      let z: number;
      do z = standardNormal(random);
      while (Math.abs(z) > 3);
      values[ref] = nominal[ref] * (1 + (z / 3) * (design.parts[ref].tolerance as number));
    }
    const result = tryFrequency(design, values);
    if ("reason" in result) continue;
    drawn[valid++] = result.hz;
    sum += result.hz;
  }
  // The nominal values are a tank (validated above), so a run where every draw failed still has one figure.
  const samples = valid > 0 ? drawn.slice(0, valid) : Float64Array.of(frequencyOf(design, nominal));
  const count = samples.length;
  const meanHz = valid > 0 ? sum / valid : samples[0];
  let squares = 0;
  for (const f of samples) squares += (f - meanHz) ** 2;
  samples.sort();
  return {
    minHz: percentile(samples, (1 - coverage) / 2),
    maxHz: percentile(samples, (1 + coverage) / 2),
    method: "monte-carlo",
    seed,
    trials,
    coverage,
    meanHz,
    stdDevHz: count > 1 ? Math.sqrt(squares / (count - 1)) : 0,
    invalidTrials: trials - valid,
  };
}
