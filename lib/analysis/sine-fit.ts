import { inverseDiagonal, solveSymmetric } from "./linear-algebra";

/** A sine fitted to a record: y[n] ≈ amplitudeV·cos(ω·n + phaseRad) + offsetV. */
export interface SineFit {
  frequencyHz: number;
  /** ω in radians per sample. */
  omegaRadPerSample: number;
  /** Peak amplitude in volts. */
  amplitudeV: number;
  /** Phase at the first sample of the fitted span, radians in (−π, π] (cosine reference). */
  phaseRad: number;
  /** Phase at the centre of the fitted span, radians (the reference that is least correlated with ω). */
  centrePhaseRad: number;
  offsetV: number;
  /** Gauss–Newton iterations run (0 for a three-parameter fit). */
  iterations: number;
  converged: boolean;
  /** Σ residual², V². */
  residualSumOfSquares: number;
  /** [(JᵀJ)⁻¹]_ωω: the variance of ω in (rad/sample)² per V² of white-noise variance. */
  omegaVarianceFactor: number;
  /** First sample and number of samples fitted. */
  start: number;
  length: number;
}

/** Options for the sine fits. */
export interface SineFitOptions {
  /** First sample of the span to fit (default 0). */
  start?: number;
  /** Samples to fit (default: to the end of the record). */
  length?: number;
  /** Largest number of Gauss–Newton steps (default 30, as in IEEE Std 1057 practice). */
  maxIterations?: number;
  /**
   * Stop when a step moves the frequency by less than this many bins (fs/N). Default 1e-9: the
   * Cramér–Rao bound of a long, clean record can be near 1e-6 bins, and each Gauss–Newton step
   * squares the error, so a tight stop costs at most one pass more.
   */
  toleranceBins?: number;
  /**
   * Σy and Σy² over the span when the caller has already summed them, in index order from the
   * span's first sample as the fit would (then the fit skips that pass and its numbers do not change).
   */
  spanSums?: { sum: number; sumOfSquares: number };
}

// Sums of the four columns [cos ωm, sin ωm, 1, ∂/∂ω] against each other and the data.
interface NormalSums {
  g: Float64Array;
  rhs: Float64Array;
  residualSumOfSquares: number;
}

// The rotation recurrence drifts by about one ulp per step; an exact restart every so often
// keeps the columns accurate to ~1e-13 over any record length. A mask, not a modulo (a division
// per sample); hot loops copy it to a local, since reading a module constant inside a function
// costs a temporal-dead-zone check on every access.
const RESYNC_MASK = 2047;
const BLOCK_SAMPLES = 2048;

/**
 * One pass over the span: the 4×4 normal equations of the linearised model about (ω, a, b, c),
 * with m = n − centre, and the residual of the current model, all summed sample by sample.
 * Used for records of few periods, where the closed forms below lose digits.
 */
function normalSumsByPass(
  y: Float64Array,
  start: number,
  length: number,
  omega: number,
  a: number,
  b: number,
  c: number,
): NormalSums {
  const centre = (length - 1) / 2;
  const rotCos = Math.cos(omega);
  const rotSin = Math.sin(omega);
  const mask = RESYNC_MASK;
  let cc = 0, cs = 0, ss = 0, c1 = 0, s1 = 0, cd = 0, sd = 0, d1 = 0, dd = 0;
  let yc = 0, ys = 0, y1 = 0, yd = 0, rss = 0;
  let zc = 0;
  let zs = 0;
  for (let n = 0; n < length; n++) {
    const m = n - centre;
    if ((n & mask) === 0) {
      zc = Math.cos(omega * m);
      zs = Math.sin(omega * m);
    }
    const v = y[start + n];
    const d = m * (b * zc - a * zs);
    cc += zc * zc;
    cs += zc * zs;
    ss += zs * zs;
    c1 += zc;
    s1 += zs;
    cd += zc * d;
    sd += zs * d;
    d1 += d;
    dd += d * d;
    yc += v * zc;
    ys += v * zs;
    y1 += v;
    yd += v * d;
    const r = v - a * zc - b * zs - c;
    rss += r * r;
    const nextCos = zc * rotCos - zs * rotSin;
    zs = zs * rotCos + zc * rotSin;
    zc = nextCos;
  }
  const g = Float64Array.of(cc, cs, c1, cd, cs, ss, s1, sd, c1, s1, length, d1, cd, sd, d1, dd);
  return { g, rhs: Float64Array.of(yc, ys, y1, yd), residualSumOfSquares: rss };
}

/** Σy·cos ωm, Σy·sin ωm, Σy·m·cos ωm, Σy·m·sin ωm over the span: the only sums that need the data. */
function dataSums(y: Float64Array, start: number, length: number, omega: number): Float64Array {
  const centre = (length - 1) / 2;
  const rc = Math.cos(omega);
  const rs = Math.sin(omega);
  const block = BLOCK_SAMPLES;
  let yc = 0;
  let ys = 0;
  let ymc = 0;
  let yms = 0;
  for (let first = 0; first < length; first += block) {
    const count = Math.min(block, length - first);
    const half = count >> 1;
    // Two halves, two rotation chains the CPU can run side by side (see harmonic-fit.ts).
    let ma = first - centre;
    let mb = ma + half;
    let ac = Math.cos(omega * ma);
    let as = Math.sin(omega * ma);
    let bc = Math.cos(omega * mb);
    let bs = Math.sin(omega * mb);
    const a0 = start + first;
    const b0 = a0 + half;
    let yca = 0, ysa = 0, ymca = 0, ymsa = 0, ycb = 0, ysb = 0, ymcb = 0, ymsb = 0;
    for (let j = 0; j < half; j++) {
      const va = y[a0 + j];
      const vb = y[b0 + j];
      const pa = va * ac;
      const qa = va * as;
      const pb = vb * bc;
      const qb = vb * bs;
      yca += pa;
      ysa += qa;
      ymca += ma * pa;
      ymsa += ma * qa;
      ycb += pb;
      ysb += qb;
      ymcb += mb * pb;
      ymsb += mb * qb;
      ma += 1;
      mb += 1;
      const nextA = ac * rc - as * rs;
      as = as * rc + ac * rs;
      ac = nextA;
      const nextB = bc * rc - bs * rs;
      bs = bs * rc + bc * rs;
      bc = nextB;
    }
    if (count & 1) {
      const v = y[a0 + count - 1];
      ycb += v * bc;
      ysb += v * bs;
      ymcb += mb * v * bc;
      ymsb += mb * v * bs;
    }
    yc += yca + ycb;
    ys += ysa + ysb;
    ymc += ymca + ymcb;
    yms += ymsa + ymsb;
  }
  return Float64Array.of(yc, ys, ymc, yms);
}

/**
 * Sums over the L centred indices m = n − (L−1)/2 in closed form: D(x) = Σcos xm =
 * sin(Lx/2)/sin(x/2), S(x) = Σm·sin xm = −D′(x), C(x) = Σm²·cos xm = −D″(x).
 */
function kernelSums(x: number, length: number): { d: number; s: number; c: number } {
  const u = x / 2;
  const big = Math.sin(length * u);
  const bigPrime = length * Math.cos(length * u);
  const bigSecond = -length * length * big;
  const small = Math.sin(u);
  const smallPrime = Math.cos(u);
  const smallSecond = -small;
  const numerator = bigPrime * small - big * smallPrime;
  const d = big / small;
  // d/dx = ½ d/du; d²/dx² = ¼ d²/du².
  const dPrime = (0.5 * numerator) / (small * small);
  const dSecond = 0.25 * ((bigSecond * small - big * smallSecond) / (small * small) - (2 * smallPrime * numerator) / (small * small * small));
  return { d, s: -dPrime, c: -dSecond };
}

/**
 * Σy and Σy² over the span, in index order (the harmonic fit's projections sum their blocks with it
 * too). A function of its own so the accumulators are locals: summed inside makeNormalSums they
 * would be variables its closure captures, and every iteration would box a double.
 */
export function plainSums(y: Float64Array, start: number, length: number): { sumY: number; sumY2: number } {
  let sumY = 0;
  let sumY2 = 0;
  for (let n = 0; n < length; n++) {
    const v = y[start + n];
    sumY += v;
    sumY2 += v * v;
  }
  return { sumY, sumY2 };
}

/**
 * The normal equations of the four-parameter fit about (ω, a, b, c) from one pass over the data
 * and closed forms for everything else. With the index centred, sums of odd functions of m vanish,
 * so the Gram matrix needs only D, S and C at ω and 2ω; the data enter through four sums, computed
 * once per ω and reused for every (a, b, c).
 */
function makeNormalSums(
  y: Float64Array,
  start: number,
  length: number,
  spanSums?: { sum: number; sumOfSquares: number },
): (omega: number, a: number, b: number, c: number) => NormalSums {
  const { sumY, sumY2 } = spanSums ? { sumY: spanSums.sum, sumY2: spanSums.sumOfSquares } : plainSums(y, start, length);
  const m2 = (length * (length * length - 1)) / 12;
  let cachedOmega = NaN;
  let cached: Float64Array = new Float64Array(4);
  return (omega, a, b, c) => {
    // Below a few periods the closed forms cancel badly (they divide by sin²(ω/2)): sum instead.
    if (omega * length < 8 * Math.PI) return normalSumsByPass(y, start, length, omega, a, b, c);
    if (omega !== cachedOmega) {
      cached = dataSums(y, start, length, omega);
      cachedOmega = omega;
    }
    const [yc, ys, ymc, yms] = cached;
    const k1 = kernelSums(omega, length);
    const k2 = kernelSums(2 * omega, length);
    const cc = (length + k2.d) / 2;
    const ss = (length - k2.d) / 2;
    const c1 = k1.d;
    const mcs = k2.s / 2; // Σ m·cos·sin
    const cd = -a * mcs;
    const sd = b * mcs;
    const d1 = -a * k1.s;
    const dd = (b * b * (m2 + k2.c)) / 2 + (a * a * (m2 - k2.c)) / 2;
    const yd = b * ymc - a * yms;
    const g = Float64Array.of(cc, 0, c1, cd, 0, ss, 0, sd, c1, 0, length, d1, cd, sd, d1, dd);
    const rss = sumY2 - 2 * (a * yc + b * ys + c * sumY) + a * a * cc + b * b * ss + c * c * length + 2 * a * c * c1;
    return { g, rhs: Float64Array.of(yc, ys, sumY, yd), residualSumOfSquares: Math.max(0, rss) };
  };
}

function solveThree(sums: NormalSums): Float64Array {
  const g = sums.g;
  const g3 = Float64Array.of(g[0], g[1], g[2], g[4], g[5], g[6], g[8], g[9], g[10]);
  return solveSymmetric(g3, sums.rhs.subarray(0, 3)).x;
}

function spanOf(y: Float64Array, options: SineFitOptions): { start: number; length: number } {
  const start = options.start ?? 0;
  const length = options.length ?? y.length - start;
  if (!Number.isInteger(start) || !Number.isInteger(length) || start < 0 || length < 4 || start + length > y.length) {
    throw new RangeError(`fit span must hold at least 4 samples inside the record, got start ${start}, length ${length}`);
  }
  return { start, length };
}

function wrapPhase(phase: number): number {
  let wrapped = phase % (2 * Math.PI);
  if (wrapped > Math.PI) wrapped -= 2 * Math.PI;
  if (wrapped <= -Math.PI) wrapped += 2 * Math.PI;
  return wrapped;
}

function toFit(
  omega: number,
  sampleRateHz: number,
  abc: Float64Array,
  sums: NormalSums,
  iterations: number,
  converged: boolean,
  start: number,
  length: number,
): SineFit {
  const [a, b, c] = abc;
  const centre = (length - 1) / 2;
  // a·cos(ωm) + b·sin(ωm) = R·cos(ωm − atan2(b, a))
  const centrePhaseRad = -Math.atan2(b, a);
  return {
    frequencyHz: (omega * sampleRateHz) / (2 * Math.PI),
    omegaRadPerSample: omega,
    amplitudeV: Math.hypot(a, b),
    phaseRad: wrapPhase(centrePhaseRad - omega * centre),
    centrePhaseRad,
    offsetV: c,
    iterations,
    converged,
    residualSumOfSquares: sums.residualSumOfSquares,
    omegaVarianceFactor: inverseDiagonal(sums.g, 4, 3),
    start,
    length,
  };
}

/**
 * Three-parameter sine fit at a known frequency (IEEE Std 1057 §4.1.3.1): linear least squares on
 * cos, sin and a constant.
 *
 * @param y - the record in volts
 * @param sampleRateHz - sample rate in Hz
 * @param frequencyHz - the known frequency in Hz
 * @param options - span of the record to fit
 * @returns the fit (its omegaVarianceFactor refers to the linearised four-parameter model)
 * @throws RangeError when the span is not inside the record
 */
export function fitSine3(y: Float64Array, sampleRateHz: number, frequencyHz: number, options: SineFitOptions = {}): SineFit {
  const { start, length } = spanOf(y, options);
  const omega = (2 * Math.PI * frequencyHz) / sampleRateHz;
  const normalSums = makeNormalSums(y, start, length);
  const abc = solveThree(normalSums(omega, 0, 0, 0));
  const sums = normalSums(omega, abc[0], abc[1], abc[2]);
  return toFit(omega, sampleRateHz, abc, sums, 0, true, start, length);
}

/**
 * Four-parameter sine fit (IEEE Std 1057-2017 §4.1.3.3; IEEE Std 1241): Gauss–Newton on amplitude,
 * phase, offset and frequency, started from a three-parameter fit at `initialFrequencyHz`. In
 * white Gaussian noise it reaches the Cramér–Rao bound (Händel 2000) once started within a
 * fraction of a bin; each step is limited to half a bin so a poor start cannot run away.
 *
 * @param y - the record in volts
 * @param sampleRateHz - sample rate in Hz
 * @param initialFrequencyHz - starting frequency in Hz (e.g. an interpolated FFT peak)
 * @param options - span, iteration limit and tolerance
 * @returns the fit, with the residual and the ω variance factor for an uncertainty estimate
 * @throws RangeError when the span is not inside the record
 */
export function fitSine4(
  y: Float64Array,
  sampleRateHz: number,
  initialFrequencyHz: number,
  options: SineFitOptions = {},
): SineFit {
  const { start, length } = spanOf(y, options);
  const maxIterations = options.maxIterations ?? 30;
  const binRad = (2 * Math.PI) / length;
  const toleranceRad = (options.toleranceBins ?? 1e-9) * binRad;
  let omega = (2 * Math.PI * initialFrequencyHz) / sampleRateHz;
  const normalSums = makeNormalSums(y, start, length, options.spanSums);
  let sums = normalSums(omega, 0, 0, 0);
  let abc = solveThree(sums);
  let iterations = 0;
  let converged = false;
  while (iterations < maxIterations) {
    sums = normalSums(omega, abc[0], abc[1], abc[2]);
    const { x } = solveSymmetric(sums.g, sums.rhs);
    iterations++;
    const step = Math.max(-binRad / 2, Math.min(binRad / 2, x[3]));
    if (!(omega + step > 0 && omega + step < Math.PI)) break;
    abc = Float64Array.of(x[0], x[1], x[2]);
    omega += step;
    if (Math.abs(step) <= toleranceRad) {
      converged = true;
      break;
    }
  }
  // The residual and Jacobian of the last step stand for the final point: the step that followed
  // them moved ω by less than the tolerance (or the caller capped the iterations on purpose).
  return toFit(omega, sampleRateHz, abc, sums, iterations, converged, start, length);
}

/**
 * 1σ of a four-parameter fit's frequency under white noise, from its own residual (n − 4 degrees of freedom) and
 * the ω variance factor, in Hz.
 */
export function fitFrequencySigmaHz(fit: SineFit, sampleRateHz: number): number {
  return (sampleRateHz / (2 * Math.PI)) * Math.sqrt(Math.max(0, (fit.residualSumOfSquares / (fit.length - 4)) * fit.omegaVarianceFactor));
}
