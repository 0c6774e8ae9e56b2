import { projectChannels, residualSums, writeCleaned } from "./harmonic-sums";
import { inverseDiagonal, solveSymmetric } from "./linear-algebra";

/** Least-squares fit of DC plus harmonics 1..H of a known fundamental. */
export interface HarmonicFit {
  /** ω of the fundamental, radians per sample. */
  omegaRadPerSample: number;
  dcV: number;
  /**
   * Orders fitted, ascending from 1: every order up to H whose folded frequency can be told apart
   * (see {@link separableOrders}); orders above Nyquist are fitted where they fold to.
   */
  orders: number[];
  /** Orders 2..H left out because their folded frequency lands on DC, Nyquist, the fundamental or another order. */
  notSeparable: NotSeparableOrder[];
  /** Peak amplitude per order, volts (index i ↔ orders[i]). */
  amplitudesVpk: number[];
  /** Phase per order at the centre of the span, radians (cosine reference). */
  centrePhasesRad: number[];
  /** cos and sin coefficients per order about the centre of the span. */
  cosV: Float64Array;
  sinV: Float64Array;
  /** Σ (y − whole model)², V²: noise only. */
  noiseSumOfSquares: number;
  /** Σ (y − DC − fundamental)², V²: noise and distortion. */
  noiseAndDistortionSumOfSquares: number;
  /**
   * Per order, the variance of its cos and sin coefficients (mean of the two) per V² of white-noise
   * variance: ([G⁻¹]cos + [G⁻¹]sin)/2, about 2/L for well-separated orders and larger where a
   * folded order sits close to another column. For detection limits.
   */
  coefficientVarianceFactors: number[];
  /** Parameters fitted (1 + 2H), for degrees of freedom. */
  parameters: number;
  start: number;
  length: number;
  /**
   * Σ and Σ² of the cleaned record over the span, summed in index order as it was written, when
   * `cleanedOut` was given (for {@link SineFitOptions.spanSums} of a fit of it).
   */
  cleanedSums?: { sum: number; sumOfSquares: number };
}

/**
 * The fit's residual variance per sample, V²: its noise over the degrees of freedom the fit leaves
 * (samples less the parameters and one), for detection limits and the white-noise σ.
 */
export function residualVariance(fit: HarmonicFit): number {
  return fit.noiseSumOfSquares / Math.max(1, fit.length - fit.parameters - 1);
}

/** Options for {@link fitHarmonics}. */
export interface HarmonicFitOptions {
  start?: number;
  length?: number;
  /**
   * Written with y − DC − Σ_{h≥2} harmonics (the record with its distortion taken out), for a
   * second, distortion-free frequency fit. Same length as the record.
   */
  cleanedOut?: Float64Array;
}

/** An order that cannot be measured on this record, and what its fold lands on. */
export interface NotSeparableOrder {
  order: number;
  /** Where the order folds to, radians per sample in [0, π]. */
  aliasRadPerSample: number;
  /** What the fold lands on within the record's resolution. */
  collidesWith: "dc" | "nyquist" | "fundamental" | "harmonic";
  /** The other order, when collidesWith is "harmonic". */
  otherOrder?: number;
}

/**
 * Where a tone at ω (radians per sample, any size) is seen once sampled: |ω − 2πk| folded into
 * [0, π] (IEEE Std 1241 practice for harmonics above half the sample rate).
 */
export function foldedRadPerSample(omegaRadPerSample: number): number {
  const turn = 2 * Math.PI;
  const r = ((omegaRadPerSample % turn) + turn) % turn;
  return r <= Math.PI ? r : turn - r;
}

/**
 * Splits orders 1..maxOrder into those a least-squares fit can measure and those it cannot. An
 * order's columns are exactly those of its folded frequency, so it can be fitted there, unless the
 * fold lands within one bin (2π/L, the record's resolution) of DC or Nyquist (where the sine column
 * vanishes), of the fundamental, or of another order's fold: the columns are then (nearly) the same
 * and the fit cannot attribute the power. Colliding orders are both left out.
 *
 * @returns the fitted orders (1 always first) and the ones left out with the reason
 */
export function separableOrders(
  omegaRadPerSample: number,
  length: number,
  maxOrder: number,
): { orders: number[]; notSeparable: NotSeparableOrder[] } {
  const bin = (2 * Math.PI) / length;
  const fundamental = foldedRadPerSample(omegaRadPerSample);
  const aliases = new Map<number, number>();
  for (let h = 2; h <= maxOrder; h++) aliases.set(h, foldedRadPerSample(h * omegaRadPerSample));
  const notSeparable: NotSeparableOrder[] = [];
  const orders = [1];
  for (let h = 2; h <= maxOrder; h++) {
    const alias = aliases.get(h) as number;
    let reason: Omit<NotSeparableOrder, "order" | "aliasRadPerSample"> | null = null;
    if (alias < bin) reason = { collidesWith: "dc" };
    else if (Math.PI - alias < bin) reason = { collidesWith: "nyquist" };
    else if (Math.abs(alias - fundamental) < bin) reason = { collidesWith: "fundamental" };
    else {
      for (let j = 2; j <= maxOrder; j++) {
        if (j !== h && Math.abs((aliases.get(j) as number) - alias) < bin) {
          reason = { collidesWith: "harmonic", otherOrder: j };
          break;
        }
      }
    }
    if (reason) notSeparable.push({ order: h, aliasRadPerSample: alias, ...reason });
    else orders.push(h);
  }
  return { orders, notSeparable };
}

/**
 * Dirichlet sum Σ_m cos(x·m) over the L centred indices m = n − (L−1)/2:
 * sin(L·x/2) / sin(x/2), with its limit ±L where sin(x/2) vanishes.
 */
function dirichlet(x: number, length: number): number {
  const half = Math.sin(x / 2);
  if (Math.abs(half) < 1e-12) {
    const turns = Math.round(x / (2 * Math.PI));
    return (turns * (length - 1)) % 2 === 0 ? length : -length;
  }
  return Math.sin((length * x) / 2) / half;
}

function gramMatrices(omega: number, length: number, orders: readonly number[]): { gc: Float64Array; gs: Float64Array } {
  // cos block over DC and the orders (the DC column is order 0), sin block over the orders.
  const cosOrders = [0, ...orders];
  const nc = cosOrders.length;
  const ns = orders.length;
  const gc = new Float64Array(nc * nc);
  const gs = new Float64Array(ns * ns);
  for (let j = 0; j < nc; j++) {
    for (let k = 0; k < nc; k++) {
      const oj = cosOrders[j];
      const ok = cosOrders[k];
      gc[j * nc + k] = 0.5 * (dirichlet((oj - ok) * omega, length) + dirichlet((oj + ok) * omega, length));
    }
  }
  for (let j = 0; j < ns; j++) {
    for (let k = 0; k < ns; k++) {
      const oj = orders[j];
      const ok = orders[k];
      gs[j * ns + k] = 0.5 * (dirichlet((oj - ok) * omega, length) - dirichlet((oj + ok) * omega, length));
    }
  }
  return { gc, gs };
}

/**
 * Harmonic levels by a multi-harmonic least-squares fit at the refined fundamental frequency
 * (IEEE Std 1057 sine fitting extended to the harmonics; IEEE Std 1241 §4.1.4).
 *
 * Why this and not FFT bins: with non-coherent sampling a tone falls between bins and leaks, so a
 * bin or lobe reading carries scallop loss and picks up the fundamental's skirt; fitting exact
 * sinusoids at h·f over the whole record has neither error, and the noise left over is the
 * residual itself (used for SNR and SINAD). With the index centred on the span, the cosine and
 * sine columns are orthogonal and their Gram matrices have closed forms (Dirichlet sums), so the
 * fit costs one pass over the data, plus one for the residual when SNR is beyond ~90 dB or the
 * cleaned record is wanted.
 *
 * @param y - the record in volts
 * @param omegaRadPerSample - fundamental ω = 2πf/fs in radians per sample
 * @param maxOrder - highest harmonic order H to fit (orders above Nyquist at their folded frequency; orders whose fold cannot be separated are left out)
 * @param options - span and an optional output buffer for the distortion-free record
 * @returns amplitudes, phases, DC and the residual sums of squares
 * @throws RangeError when the span is not inside the record or maxOrder < 1
 */
export function fitHarmonics(
  y: Float64Array,
  omegaRadPerSample: number,
  maxOrder: number,
  options: HarmonicFitOptions = {},
): HarmonicFit {
  return fitHarmonicsOfChannels([y], omegaRadPerSample, maxOrder, options)[0];
}

/**
 * {@link fitHarmonics} for several channels sampled together, sharing one pass over the record
 * (the harmonic columns are computed once). `cleanedOut` applies to the first channel.
 *
 * @param ys - channels of equal length, volts
 * @returns one fit per channel, in order
 * @throws RangeError when the channels differ in length, the span is not inside them or maxOrder < 1
 */
export function fitHarmonicsOfChannels(
  ys: readonly Float64Array[],
  omegaRadPerSample: number,
  maxOrder: number,
  options: HarmonicFitOptions = {},
): HarmonicFit[] {
  const recordLength = ys[0].length;
  if (ys.some((y) => y.length !== recordLength)) {
    throw new RangeError(`channels must have the same length, got ${ys.map((y) => y.length).join(", ")}`);
  }
  const start = options.start ?? 0;
  const length = options.length ?? recordLength - start;
  if (start < 0 || length < 4 || start + length > recordLength) {
    throw new RangeError(`harmonic fit span must hold at least 4 samples inside the record, got start ${start}, length ${length}`);
  }
  if (!Number.isInteger(maxOrder) || maxOrder < 1) {
    throw new RangeError(`harmonic order must be an integer ≥ 1, got ${maxOrder}`);
  }
  const omega = omegaRadPerSample;
  const { orders, notSeparable } = separableOrders(omega, length, maxOrder);
  const orderCount = orders.length;
  const nc = orderCount + 1;
  const { gc, gs } = gramMatrices(omega, length, orders);
  const projections = projectChannels(ys, start, length, omega, orders);
  const coefficientVarianceFactors = orders.map((_, i) => (inverseDiagonal(gc, nc, i + 1) + inverseDiagonal(gs, orderCount, i)) / 2);

  return ys.map((y, channel) => {
    const { pc, ps, sumOfSquares } = projections[channel];
    const cosSolution = solveSymmetric(gc, pc).x;
    const sinV = solveSymmetric(gs, ps).x;
    const dcV = cosSolution[0];
    const cosV = cosSolution.slice(1);
    // Residual sums in closed form, ‖y − Xβ‖² = yᵀy − 2βᵀXᵀy + βᵀGβ (= yᵀy − βᵀXᵀy at the
    // solution); the cosine and sine blocks are orthogonal, so the noise-and-distortion model
    // (DC and fundamental only) needs just the top-left corners of the Gram matrices.
    const a1 = cosV[0];
    const b1 = sinV[0];
    let explained = 0;
    for (let j = 0; j < nc; j++) explained += cosSolution[j] * pc[j];
    for (let j = 0; j < orderCount; j++) explained += sinV[j] * ps[j];
    let noise = sumOfSquares - explained;
    let noiseAndDistortion =
      sumOfSquares -
      2 * (dcV * pc[0] + a1 * pc[1] + b1 * ps[0]) +
      dcV * dcV * gc[0] +
      2 * dcV * a1 * gc[1] +
      a1 * a1 * gc[nc + 1] +
      b1 * b1 * gs[0];
    // The subtraction loses digits when the residual is tiny against the signal (SNR beyond
    // ~90 dB): then take the residual sample by sample.
    const model = { start, length, omega, dcV, cosV, sinV, orders };
    if (!(noise > 1e-9 * sumOfSquares)) ({ noise, noiseAndDistortion } = residualSums(y, model));
    const cleaned = channel === 0 ? options.cleanedOut : undefined;
    const cleanedSums = cleaned && writeCleaned(y, model, cleaned);
    return {
      omegaRadPerSample: omega,
      dcV,
      orders,
      amplitudesVpk: orders.map((_, i) => Math.hypot(cosV[i], sinV[i])),
      centrePhasesRad: orders.map((_, i) => -Math.atan2(sinV[i], cosV[i])),
      cosV,
      sinV,
      noiseSumOfSquares: Math.max(0, noise),
      noiseAndDistortionSumOfSquares: Math.max(0, noiseAndDistortion),
      notSeparable,
      coefficientVarianceFactors,
      parameters: 1 + 2 * orderCount,
      start,
      length,
      ...(cleanedSums ? { cleanedSums } : {}),
    };
  });
}
