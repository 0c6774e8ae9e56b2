import FFT from "fft.js";

/** The fields of an fft.js 4.x plan that its transforms read. */
interface PlanFields {
  size: number;
  _csize: number;
  table: ArrayLike<number>;
  _width: number;
  _bitrev: ArrayLike<number>;
  _out: unknown;
  _data: unknown;
  _inv: number;
}

const EXPECTED_FIELDS = ["size", "_csize", "table", "_width", "_bitrev", "_out", "_data", "_inv"].sort().join();
// The fields of a real plan; if an fft.js upgrade changes them, fall back to its own constructor.
const fastPlansSupported = Object.keys(new FFT(4)).sort().join() === EXPECTED_FIELDS;

/**
 * An fft.js plan with its twiddle and bit-reversal tables in typed arrays.
 *
 * fft.js's constructor fills a plain Array of 2N numbers with 2N trig calls: at N = 2^20 that takes
 * longer than the transform, and V8 keeps an Array that large in slow dictionary mode, which then
 * slows every table read. The values here are the same (cos and −sin of 2πk/N, built from a
 * quarter wave by symmetry), so fft.js's transform code runs unchanged, only faster.
 */
function fastPlan(size: number, realOnly: boolean): FFT {
  const plan = Object.create(FFT.prototype) as PlanFields;
  const quarter = size / 4;
  const q = new Float64Array(quarter + 1);
  for (let j = 0; j <= quarter; j++) q[j] = Math.cos((2 * Math.PI * j) / size);
  // fft.js's real transform reads the table at k, 2k and 3k (and +1) for twiddle indices k up to
  // N/4, so entries past 3N/4 + 1 are never read: a real-only plan keeps 3/8 of the table
  // (at N = 2^22, 24 MB instead of 64 MB). The complex transforms read further and get it whole.
  const length = realOnly ? Math.min(2 * size, (3 * size) / 4 + 2) : 2 * size;
  // One quarter wave gives all four: θ, θ + π/2, θ + π and θ + 3π/2.
  const table = new Float64Array(length);
  const put = (index: number, value: number) => {
    if (index < length) table[index] = value;
  };
  for (let k = 0; k < quarter; k++) {
    const c = q[k];
    const s = q[quarter - k];
    put(2 * k, c);
    put(2 * k + 1, -s);
    put(2 * (k + quarter), -s);
    put(2 * (k + quarter) + 1, -c);
    put(2 * (k + 2 * quarter), -c);
    put(2 * (k + 2 * quarter) + 1, s);
    put(2 * (k + 3 * quarter), s);
    put(2 * (k + 3 * quarter) + 1, c);
  }
  let power = 0;
  for (let t = 1; size > t; t <<= 1) power++;
  const width = power % 2 === 0 ? power - 1 : power;
  const bitrev = new Int32Array(1 << width);
  for (let j = 0; j < bitrev.length; j++) {
    let reversed = 0;
    for (let shift = 0; shift < width; shift += 2) reversed |= ((j >>> shift) & 3) << (width - shift - 2);
    bitrev[j] = reversed;
  }
  plan.size = size;
  plan._csize = size << 1;
  plan.table = table;
  plan._width = width;
  plan._bitrev = bitrev;
  plan._out = null;
  plan._data = null;
  plan._inv = 0;
  return plan as unknown as FFT;
}

// A plan holds tables of 2.5N numbers; the worker analyses many captures of the same length.
// Keyed by size, negative for real-only plans.
const plans = new Map<number, FFT>();
const MAX_CACHED_PLANS = 4;

/**
 * The fft.js plan for a size, built once and cached.
 * @param size - a power of two ≥ 4 for the fast tables (smaller sizes use fft.js's constructor)
 * @param fast - false to use fft.js's own constructor (for tests that compare the two)
 * @param realOnly - a plan for `realTransform` only, with the part of the table it reads (3/8 of
 *   it); its complex transforms would read past the end
 */
export function fftPlan(size: number, fast = true, realOnly = false): FFT {
  if (!fast) return new FFT(size);
  const key = realOnly ? -size : size;
  let plan = plans.get(key);
  if (!plan) {
    if (plans.size >= MAX_CACHED_PLANS) plans.delete(plans.keys().next().value as number);
    plan = fastPlansSupported && size >= 16 ? fastPlan(size, realOnly) : new FFT(size);
    plans.set(key, plan);
  }
  return plan;
}

/**
 * The smallest power of two ≥ n (and ≥ 2).
 * @throws RangeError when n is not a positive integer
 */
export function nextPowerOfTwo(n: number): number {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`length must be a positive integer, got ${n}`);
  let size = 2;
  while (size < n) size *= 2;
  return size;
}

/**
 * Forward DFT of a real sequence through fft.js: X[k] = Σ x[n]·e^(−2πikn/N).
 *
 * @param input - N real samples, N a power of two ≥ 2 (zero-pad first with {@link nextPowerOfTwo})
 * @param out - optional output buffer of 2N numbers, reused between calls
 * @returns interleaved complex bins; bins 0..N/2 (re at 2k, im at 2k+1) are filled, the rest are
 *   the mirror image and are not written
 * @throws RangeError when N is not a power of two ≥ 2
 */
export function realFft(input: Float64Array, out?: Float64Array): Float64Array {
  const size = input.length;
  if (size < 2 || (size & (size - 1)) !== 0) {
    throw new RangeError(`FFT length must be a power of two ≥ 2, got ${size}`);
  }
  const result = out && out.length === 2 * size ? out : new Float64Array(2 * size);
  fftPlan(size, true, true).realTransform(result, input);
  return result;
}
