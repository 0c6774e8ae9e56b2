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

// The twiddles of the split step come from a rotation restarted from exact values every this many
// bins (a power of two), so its round-off (about an ulp a step) cannot build up.
const TWIDDLE_BLOCK = 1024;

/**
 * Adds |X[k]|² of a real sequence's DFT to power[k] for k = 0..N/2, through a complex FFT of half
 * the length: the even and odd samples as one complex sequence z[n] = x[2n] + i·x[2n+1], then
 * X[k] = E[k] + e^(−2πik/N)·O[k] with E[k] = (Z[k] + Z*[M−k])/2 and O[k] = (Z[k] − Z*[M−k])/2i,
 * M = N/2 (the standard split; Numerical Recipes §12.3, from memory). fft.js's real transform runs a
 * full N-point pass: at N = 2^22 the half-length transform takes 0.7 of its time (0.8 with the split
 * step) and half its output buffer. The powers agree with it, and with the DFT summed directly, to
 * 1e-13 of the largest bin (tests/unit/analysis/fft-power.test.ts).
 *
 * @param input - N real samples, N a power of two ≥ 2; read as N/2 interleaved complex values
 * @param power - N/2 + 1 sums to add to
 * @param scratch - optional buffer of N numbers for the half-length transform, reused between calls
 * @returns the scratch buffer, for the next call
 * @throws RangeError when N is not a power of two ≥ 2 or power is shorter than N/2 + 1
 */
export function addRealPower(input: Float64Array, power: Float64Array, scratch?: Float64Array): Float64Array {
  const size = input.length;
  if (size < 2 || (size & (size - 1)) !== 0) throw new RangeError(`FFT length must be a power of two ≥ 2, got ${size}`);
  const half = size / 2;
  if (power.length < half + 1) throw new RangeError(`power needs ${half + 1} bins, got ${power.length}`);
  if (size === 2) {
    // No half-length FFT of one point in fft.js: the two bins directly.
    power[0] += (input[0] + input[1]) ** 2;
    power[1] += (input[0] - input[1]) ** 2;
    return scratch ?? new Float64Array(2);
  }
  const z = scratch && scratch.length === size ? scratch : new Float64Array(size);
  fftPlan(half).transform(z, input);
  const step = (2 * Math.PI) / size;
  const rc = Math.cos(step);
  const rs = Math.sin(step);
  // A mask in a local: a module constant read in a hot loop pays a temporal-dead-zone check, and a
  // modulo a division.
  const restartMask = TWIDDLE_BLOCK - 1;
  let wc = 1;
  let ws = 0;
  for (let k = 0; k <= half; k++) {
    if ((k & restartMask) === 0) {
      wc = Math.cos(step * k);
      ws = Math.sin(step * k);
    }
    const j = k === half ? 0 : k;
    const m = k === 0 ? 0 : half - k;
    const ar = z[2 * j];
    const ai = z[2 * j + 1];
    const br = z[2 * m];
    const bi = -z[2 * m + 1];
    // E = (a + b)/2; O = (a − b)/(2i) = (Im(a − b) − i·Re(a − b))/2; X = E + (wc − i·ws)·O.
    const er = 0.5 * (ar + br);
    const ei = 0.5 * (ai + bi);
    const or = 0.5 * (ai - bi);
    const oi = -0.5 * (ar - br);
    const xr = er + wc * or + ws * oi;
    const xi = ei + wc * oi - ws * or;
    power[k] += xr * xr + xi * xi;
    const nextCos = wc * rc - ws * rs;
    ws = ws * rc + wc * rs;
    wc = nextCos;
  }
  return z;
}
