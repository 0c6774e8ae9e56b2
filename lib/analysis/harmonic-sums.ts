/*
 * The sample-by-sample passes of the harmonic fit: the projections of a record on cos and sin of
 * each order, and the model rebuilt from the fitted coefficients. These are the hottest loops of
 * the engine (10 orders over every sample, two or three times per analysis).
 *
 * Both run the two-term recurrence every sampled sinusoid at ω obeys, x[m+1] = 2cos ω·x[m] − x[m−1],
 * in Reinsch's form (lib/analysis/goertzel.ts): one multiply and three adds per order and sample,
 * where rotating e^{iωm} cost six flops before the data was touched. The projections run it as the
 * Goertzel filter, the model as a sinusoid generator. Each block is split into four chains the CPU
 * runs side by side (a step waits on the one before it), each started from exact values, so
 * round-off grows only over ~512 samples. Against the definitions summed directly
 * (tests/unit/analysis/harmonic-sums.test.ts), from ω = 0.0007 to 3.1 rad/sample: the sums within
 * 2e-13 of Σ|y|, the model within 1e-12 V. 10M samples, 10 orders, two channels: 0.26 → 0.15 s.
 */

import { chainSums, recurrence } from "./goertzel";
import { plainSums } from "./sine-fit";

/** Projections of one channel on its fitted columns. */
export interface Projections {
  /** Σy·cos(hωm) for h = 0..H (h = 0 is Σy), m the index centred on the span. */
  pc: Float64Array;
  /** Σy·sin(hωm) for h = 1..H at index h − 1. */
  ps: Float64Array;
  sumOfSquares: number;
}

// Blocks that stay in the L1 cache: four chains of 512 samples for one channel, two of 1024 for
// each channel of a pair.
const BLOCK_SAMPLES = 2048;

/**
 * Projections of several channels sampled together at ω on the given orders (pairs share a pass,
 * so each block is read while it is in the cache).
 */
export function projectChannels(
  ys: readonly Float64Array[],
  start: number,
  length: number,
  omega: number,
  orders: readonly number[],
): Projections[] {
  const orderCount = orders.length;
  const centre = (length - 1) / 2;
  // Per channel: [Σy, Σy², (Σcos, Σsin) per order].
  const sums = ys.map(() => new Float64Array(2 + 2 * orderCount));
  // The four chains' (q, d) after each block, one buffer for the whole pass.
  const state = new Float64Array(8);
  for (let first = 0; first < length; first += BLOCK_SAMPLES) {
    const count = Math.min(BLOCK_SAMPLES, length - first);
    const from = start + first;
    for (let k = 0; k < ys.length; k++) {
      const { sumY, sumY2 } = plainSums(ys[k], from, count);
      sums[k][0] += sumY;
      sums[k][1] += sumY2;
    }
    for (let k = 0; k < ys.length; k += 2) {
      if (k + 1 < ys.length) goertzelTwo(ys[k], ys[k + 1], from, count, first - centre, omega, orders, sums[k], sums[k + 1], state);
      else goertzelOne(ys[k], from, count, first - centre, omega, orders, sums[k], state);
    }
  }
  return sums.map((s) => {
    const pc = new Float64Array(orderCount + 1);
    const ps = new Float64Array(orderCount);
    pc[0] = s[0];
    for (let h = 0; h < orderCount; h++) {
      pc[h + 1] = s[2 + 2 * h];
      ps[h] = s[3 + 2 * h];
    }
    return { pc, ps, sumOfSquares: s[1] };
  });
}

/** One block of one channel: four chains per order, over quarters of the block. */
function goertzelOne(
  y: Float64Array,
  from: number,
  count: number,
  m0: number,
  omega: number,
  orders: readonly number[],
  out: Float64Array,
  state: Float64Array,
): void {
  const quarter = count >> 2;
  const last = count - 3 * quarter;
  const a = from;
  const b = a + quarter;
  const c = b + quarter;
  const e = c + quarter;
  for (let h = 0; h < orders.length; h++) {
    const w = orders[h] * omega;
    const r = recurrence(w);
    fourChains(y, a, y, b, y, c, y, e, quarter, r.low, r.lambda, state);
    chainTail(y, e + quarter, last - quarter, r.low, r.lambda, state, 6);
    const at = 2 + 2 * h;
    chainSums(state[0], state[1], r, w, m0, quarter, out, at);
    chainSums(state[2], state[3], r, w, m0 + quarter, quarter, out, at);
    chainSums(state[4], state[5], r, w, m0 + 2 * quarter, quarter, out, at);
    chainSums(state[6], state[7], r, w, m0 + 3 * quarter, last, out, at);
  }
}

/**
 * Four Goertzel chains in Reinsch's form, run side by side for n samples from a zero state over
 * p[pa..), q[qa..), r[ra..) and s[sa..) (the arrays may be the same one); writes each chain's
 * (q, d) to state, in that order.
 */
function fourChains(
  p: Float64Array, pa: number, q: Float64Array, qa: number, r: Float64Array, ra: number, s: Float64Array, sa: number,
  n: number, low: boolean, lambda: number, state: Float64Array,
): void {
  let q0 = 0, d0 = 0, q1 = 0, d1 = 0, q2 = 0, d2 = 0, q3 = 0, d3 = 0;
  if (low) {
    for (let j = 0; j < n; j++) {
      d0 += lambda * q0 + p[pa + j];
      q0 += d0;
      d1 += lambda * q1 + q[qa + j];
      q1 += d1;
      d2 += lambda * q2 + r[ra + j];
      q2 += d2;
      d3 += lambda * q3 + s[sa + j];
      q3 += d3;
    }
  } else {
    for (let j = 0; j < n; j++) {
      d0 = lambda * q0 - d0 + p[pa + j];
      q0 = d0 - q0;
      d1 = lambda * q1 - d1 + q[qa + j];
      q1 = d1 - q1;
      d2 = lambda * q2 - d2 + r[ra + j];
      q2 = d2 - q2;
      d3 = lambda * q3 - d3 + s[sa + j];
      q3 = d3 - q3;
    }
  }
  state[0] = q0;
  state[1] = d0;
  state[2] = q1;
  state[3] = d1;
  state[4] = q2;
  state[5] = d2;
  state[6] = q3;
  state[7] = d3;
}

/** Runs the chain whose (q, d) is at state[at] on over x[from..from+count): a block's tail samples. */
function chainTail(x: Float64Array, from: number, count: number, low: boolean, lambda: number, state: Float64Array, at: number): void {
  let q = state[at];
  let d = state[at + 1];
  for (let j = 0; j < count; j++) {
    if (low) {
      d += lambda * q + x[from + j];
      q += d;
    } else {
      d = lambda * q - d + x[from + j];
      q = d - q;
    }
  }
  state[at] = q;
  state[at + 1] = d;
}

/** One block of two channels: two chains per channel and order, over halves of the block. */
function goertzelTwo(
  y: Float64Array,
  z: Float64Array,
  from: number,
  count: number,
  m0: number,
  omega: number,
  orders: readonly number[],
  outY: Float64Array,
  outZ: Float64Array,
  state: Float64Array,
): void {
  const half = count >> 1;
  const last = count - half;
  const a = from;
  const b = a + half;
  for (let h = 0; h < orders.length; h++) {
    const w = orders[h] * omega;
    const r = recurrence(w);
    fourChains(y, a, y, b, z, a, z, b, half, r.low, r.lambda, state);
    chainTail(y, b + half, last - half, r.low, r.lambda, state, 2);
    chainTail(z, b + half, last - half, r.low, r.lambda, state, 6);
    const at = 2 + 2 * h;
    chainSums(state[0], state[1], r, w, m0, half, outY, at);
    chainSums(state[2], state[3], r, w, m0 + half, last, outY, at);
    chainSums(state[4], state[5], r, w, m0, half, outZ, at);
    chainSums(state[6], state[7], r, w, m0 + half, last, outZ, at);
  }
}

/** What {@link residualSums} returns. */
export interface ResidualSums {
  /** Σ(y − model)², V². */
  noise: number;
  /** Σ(y − DC − fundamental)², V². */
  noiseAndDistortion: number;
}

/** A fitted model over a span: DC + Σ_h (cos_h·cos hωm + sin_h·sin hωm), m centred on the span. */
export interface HarmonicModel {
  start: number;
  length: number;
  /** The fundamental, radians per sample. */
  omega: number;
  dcV: number;
  /** cos and sin coefficients, index i ↔ orders[i]. */
  cosV: Float64Array;
  sinV: Float64Array;
  /** The fitted orders, orders[0] = 1 (the fundamental). */
  orders: readonly number[];
}

/** One block of a model rebuilt by {@link modelBlocks}; the buffers are reused from block to block. */
interface ModelBlock {
  /** Index in the record of the block's first sample. */
  offset: number;
  count: number;
  /** Σ_{h≥2} harmonics over the block. */
  distortion: Float64Array;
  /** The fundamental over the block, when asked for (else left empty). */
  fundamental: Float64Array;
}

/**
 * The model over its span, block by block (blocks that stay in the cache while the caller reads the
 * record beside them): the harmonics h ≥ 2 and, when asked for, the fundamental apart.
 */
function* modelBlocks(model: HarmonicModel, withFundamental: boolean): Generator<ModelBlock> {
  const { start, length, omega, cosV, sinV, orders } = model;
  const centre = (length - 1) / 2;
  const block: ModelBlock = { offset: start, count: 0, distortion: new Float64Array(BLOCK_SAMPLES), fundamental: new Float64Array(withFundamental ? BLOCK_SAMPLES : 0) };
  const starts = new Float64Array(8);
  for (let first = 0; first < length; first += BLOCK_SAMPLES) {
    const count = Math.min(BLOCK_SAMPLES, length - first);
    if (withFundamental) {
      block.fundamental.fill(0, 0, count);
      addSinusoid(block.fundamental, count, orders[0] * omega, first - centre, cosV[0], sinV[0], starts);
    }
    block.distortion.fill(0, 0, count);
    for (let h = 1; h < orders.length; h++) addSinusoid(block.distortion, count, orders[h] * omega, first - centre, cosV[h], sinV[h], starts);
    block.offset = start + first;
    block.count = count;
    yield block;
  }
}

/** Σ(y − model)² and Σ(y − DC − fundamental)², sample by sample. */
export function residualSums(y: Float64Array, model: HarmonicModel): ResidualSums {
  const dcV = model.dcV;
  let noise = 0;
  let noiseAndDistortion = 0;
  for (const { offset, count, distortion, fundamental } of modelBlocks(model, true)) {
    for (let j = 0; j < count; j++) {
      const nad = y[offset + j] - dcV - fundamental[j];
      const r = nad - distortion[j];
      noise += r * r;
      noiseAndDistortion += nad * nad;
    }
  }
  return { noise, noiseAndDistortion };
}

/**
 * Writes the cleaned record y − DC − Σ_{h≥2} harmonics (the distortion taken out, the fundamental
 * left in) over the model's span, and returns its Σ and Σ² summed in index order as written.
 */
export function writeCleaned(y: Float64Array, model: HarmonicModel, cleaned: Float64Array): { sum: number; sumOfSquares: number } {
  const dcV = model.dcV;
  let sum = 0;
  let sumOfSquares = 0;
  for (const { offset, count, distortion } of modelBlocks(model, false)) {
    for (let j = 0; j < count; j++) {
      const v = y[offset + j] - dcV - distortion[j];
      cleaned[offset + j] = v;
      sum += v;
      sumOfSquares += v * v;
    }
  }
  return { sum, sumOfSquares };
}

/**
 * Adds a·cos(w·m) + b·sin(w·m) to target[0..count), m = m0 + j: four generator chains over
 * quarters of the stretch in Reinsch's form, each started from its exact first value and first
 * difference (or sum), which go through `starts` (8 numbers, the caller's, reused block to block).
 */
function addSinusoid(target: Float64Array, count: number, w: number, m0: number, a: number, b: number, starts: Float64Array): void {
  const quarter = count >> 2;
  const r = recurrence(w);
  const lambda = r.lambda;
  const cosHalf = Math.cos(w / 2);
  const sinHalf = Math.sin(w / 2);
  for (let chain = 0; chain < 4; chain++) {
    const theta = w * (m0 + chain * quarter);
    const c = Math.cos(theta);
    const s = Math.sin(theta);
    // x[0] − x[−1] = −2 sin(w/2)·(a·sin − b·cos)(θ − w/2); x[0] + x[−1] = 2 cos(w/2)·(a·cos + b·sin)(θ − w/2).
    const cm = c * cosHalf + s * sinHalf;
    const sm = s * cosHalf - c * sinHalf;
    starts[2 * chain] = a * c + b * s;
    starts[2 * chain + 1] = r.low ? -2 * sinHalf * (a * sm - b * cm) : 2 * cosHalf * (a * cm + b * sm);
  }
  let ua = starts[0], da = starts[1], ub = starts[2], db = starts[3];
  let uc = starts[4], dc = starts[5], ue = starts[6], de = starts[7];
  const b0 = quarter;
  const c0 = 2 * quarter;
  const e0 = 3 * quarter;
  if (r.low) {
    for (let j = 0; j < quarter; j++) {
      target[j] += ua;
      target[b0 + j] += ub;
      target[c0 + j] += uc;
      target[e0 + j] += ue;
      da += lambda * ua;
      ua += da;
      db += lambda * ub;
      ub += db;
      dc += lambda * uc;
      uc += dc;
      de += lambda * ue;
      ue += de;
    }
    for (let j = e0 + quarter; j < count; j++) {
      target[j] += ue;
      de += lambda * ue;
      ue += de;
    }
  } else {
    for (let j = 0; j < quarter; j++) {
      target[j] += ua;
      target[b0 + j] += ub;
      target[c0 + j] += uc;
      target[e0 + j] += ue;
      da = lambda * ua - da;
      ua = da - ua;
      db = lambda * ub - db;
      ub = db - ub;
      dc = lambda * uc - dc;
      uc = dc - uc;
      de = lambda * ue - de;
      ue = de - ue;
    }
    for (let j = e0 + quarter; j < count; j++) {
      target[j] += ue;
      de = lambda * ue - de;
      ue = de - ue;
    }
  }
}
