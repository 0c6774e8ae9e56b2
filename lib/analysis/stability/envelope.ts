import type { StabilityEnvelope } from "./types";

/** Segments the envelope is summarised in to tell a start-up from a ring-down. */
const SEGMENTS = 16;
/** Most points in the drawn envelope. */
const CURVE_POINTS = 200;
/** Fewer blocks (periods) than this and the envelope's shape is not resolved. */
export const MIN_ENVELOPE_BLOCKS = 32;

/** Inputs of {@link measureEnvelope}. */
export interface EnvelopeInputs {
  /** Fundamental amplitude per block of one period, V peak. */
  amplitudeVpk: Float64Array;
  blockSamples: number;
  sampleRateHz: number;
  startTimeS: number;
  frequencyHz: number;
  /** The engine's envelope check: true steady, false not steady, undefined not run (under six periods). */
  steady: boolean | undefined;
}

function median(values: ArrayLike<number>): number {
  const sorted = Float64Array.from(values).sort();
  const n = sorted.length;
  return n === 0 ? NaN : n % 2 ? sorted[(n - 1) / 2] : (sorted[n / 2 - 1] + sorted[n / 2]) / 2;
}

function mean(a: Float64Array, from: number, to: number): number {
  let sum = 0;
  for (let i = from; i < to; i++) sum += a[i];
  return sum / Math.max(1, to - from);
}

/**
 * Noise of one block's amplitude: from second differences, which cancel any smooth transient;
 * the median absolute value scaled by 1.4826 (Rousseeuw & Croux 1993) and by √6 (a second
 * difference of independent values has six times their variance).
 */
export function blockAmplitudeNoise(a: Float64Array): number {
  if (a.length < 3) return 0;
  const d = new Float64Array(a.length - 2);
  for (let i = 0; i < d.length; i++) d[i] = Math.abs(a[i + 2] - 2 * a[i + 1] + a[i]);
  return (1.4826 * median(d)) / Math.sqrt(6);
}

/** Weighted least-squares line y = c + b·t with the slope's 1σ scaled by the residual scatter (reduced χ²). */
export function weightedLine(t: number[], y: number[], w: number[]): { slope: number; intercept: number; slopeSigma: number } | undefined {
  const n = t.length;
  if (n < 3) return undefined;
  let sw = 0, st = 0, sy = 0;
  for (let i = 0; i < n; i++) {
    sw += w[i];
    st += w[i] * t[i];
    sy += w[i] * y[i];
  }
  const tm = st / sw;
  const ym = sy / sw;
  let stt = 0, sty = 0;
  for (let i = 0; i < n; i++) {
    stt += w[i] * (t[i] - tm) ** 2;
    sty += w[i] * (t[i] - tm) * (y[i] - ym);
  }
  if (!(stt > 0)) return undefined;
  const slope = sty / stt;
  const intercept = ym - slope * tm;
  let chi2 = 0;
  for (let i = 0; i < n; i++) chi2 += w[i] * (y[i] - intercept - slope * t[i]) ** 2;
  // Textbook weighted least squares: var(b) = 1/Σw(t−t̄)², times χ²/(n−2) so misfit widens it.
  return { slope, intercept, slopeSigma: Math.sqrt(chi2 / (n - 2) / stt) };
}

function crossingTime(t: number[], a: Float64Array, k: number, level: number): number {
  // Linear between block k−1 (below) and block k (at or above).
  if (k <= 0) return t[0];
  const span = a[k] - a[k - 1];
  const fraction = span > 0 ? (level - a[k - 1]) / span : 0;
  return t[k - 1] + Math.min(1, Math.max(0, fraction)) * (t[k] - t[k - 1]);
}

/**
 * Start-up or ring-down of the fundamental's envelope. A start-up rises to a settled amplitude:
 * the start-up time runs from the first visible oscillation (the envelope's last rise through six
 * block-noise deviations, or 1 % of the settled amplitude if higher) to 90 % of the settled
 * amplitude (the median of the last tenth), and the growth rate is the slope of ln A while the
 * envelope is under half of it. A ring-down decays from a peak: A(t) = A0·e^{−t/τ} fitted to
 * ln A by weighted least squares (weights A²/σ², var(ln A) = σ²/A²) from where it has fallen 5 % below
 * the peak to where it nears the noise (10 deviations), and Q = π·f0·τ (REFERENCES.md, ring-down Q).
 */
export function measureEnvelope(inputs: EnvelopeInputs): StabilityEnvelope {
  const { amplitudeVpk: a, blockSamples, sampleRateHz, startTimeS, frequencyHz, steady } = inputs;
  const blocks = a.length;
  const t: number[] = [];
  for (let k = 0; k < blocks; k++) t.push(startTimeS + (k * blockSamples + (blockSamples - 1) / 2) / sampleRateHz);
  const curve = thin(t, a);
  const base: StabilityEnvelope = {
    kind: "unknown",
    startUpS: null,
    growthPerS: null,
    decayTauS: null,
    decayTauSigmaS: null,
    q: null,
    qSigma: null,
    settledVpk: null,
    curve,
    reason: null,
  };
  if (steady === undefined || blocks < MIN_ENVELOPE_BLOCKS) {
    return { ...base, reason: `only ${blocks} periods in the record; the envelope's shape needs at least ${MIN_ENVELOPE_BLOCKS}` };
  }
  if (steady) {
    // A flat line is not worth storing with every run: the curve is kept for transients only.
    return { ...base, kind: "steady", curve: null, reason: "the amplitude is steady across the record: no start-up or ring-down to measure" };
  }
  const segment = Math.floor(blocks / SEGMENTS);
  const s = Array.from({ length: SEGMENTS }, (_, i) => mean(a, i * segment, (i + 1) * segment));
  const peakSegment = s.indexOf(Math.max(...s));
  const peak = s[peakSegment];
  const noise = blockAmplitudeNoise(a);
  const first = s[0];
  const last = s[SEGMENTS - 1];
  if (last >= 0.8 * peak && first < 0.7 * peak) return startUp(base, t, a, noise);
  const falling = s.slice(peakSegment + 1).every((v, i) => v <= s[peakSegment + i] * 1.05 + 3 * noise);
  if (last < 0.7 * peak && peakSegment < SEGMENTS / 2 && falling) return ringDown(base, t, a, noise, frequencyHz);
  return {
    ...base,
    reason: "the amplitude changes across the record but neither rises to a settled level nor decays from a peak (a wandering or pulsing envelope, as in squegging), so no start-up or ring-down figure applies",
  };
}

function startUp(base: StabilityEnvelope, t: number[], a: Float64Array, noise: number): StabilityEnvelope {
  const blocks = a.length;
  const tail = Math.max(4, Math.floor(blocks / 10));
  const settled = median(a.subarray(blocks - tail));
  const out: StabilityEnvelope = { ...base, kind: "start-up", settledVpk: settled };
  const halfTail = Math.floor(tail / 2);
  const lastHalf = mean(a, blocks - halfTail, blocks);
  const firstHalf = mean(a, blocks - tail, blocks - halfTail);
  if (Math.abs(lastHalf - firstHalf) > 0.05 * settled) {
    return { ...out, settledVpk: null, reason: "the amplitude is still changing at the end of the record, so the settled level and the start-up time are not in it; capture longer after the start" };
  }
  const k90 = a.findIndex((v) => v >= 0.9 * settled);
  const visible = Math.max(6 * noise, 0.01 * settled);
  let kv = -1;
  for (let k = k90 - 1; k >= 0; k--) {
    if (a[k] < visible) {
      kv = k;
      break;
    }
  }
  if (kv < 0) {
    return { ...out, reason: "the oscillation is already visible in the first period of the record, so its start is not captured; trigger earlier (before the supply is switched on)" };
  }
  const tVisible = crossingTime(t, a, kv + 1, visible);
  const t90 = crossingTime(t, a, k90, 0.9 * settled);
  out.startUpS = Math.max(0, t90 - tVisible);
  const ts: number[] = [];
  const ys: number[] = [];
  const ws: number[] = [];
  for (let k = kv + 1; k < k90; k++) {
    if (a[k] > visible && a[k] < 0.5 * settled) {
      ts.push(t[k]);
      ys.push(Math.log(a[k]));
      ws.push(a[k] * a[k]);
    }
  }
  const line = weightedLine(ts, ys, ws);
  if (line && line.slope > 0) out.growthPerS = line.slope;
  else out.reason = `growth rate not measured: only ${ts.length} periods lie between the first visible oscillation and half the settled amplitude (at least 3 are needed)`;
  return out;
}

function ringDown(base: StabilityEnvelope, t: number[], a: Float64Array, noise: number, frequencyHz: number): StabilityEnvelope {
  let kp = 0;
  for (let k = 1; k < a.length; k++) if (a[k] > a[kp]) kp = k;
  const out: StabilityEnvelope = { ...base, kind: "ring-down" };
  let start = kp;
  while (start < a.length && a[start] > 0.95 * a[kp]) start++;
  const floor = 10 * noise;
  const ts: number[] = [];
  const ys: number[] = [];
  const ws: number[] = [];
  for (let k = start; k < a.length && a[k] > floor; k++) {
    ts.push(t[k] - t[start]);
    ys.push(Math.log(a[k]));
    ws.push(a[k] * a[k]);
  }
  const line = ts.length >= 8 ? weightedLine(ts, ys, ws) : undefined;
  if (!line || !(line.slope < 0)) {
    return { ...out, reason: `the decay is not resolved: ${ts.length} periods lie between the peak and the noise (at least 8 are needed, falling)` };
  }
  const tau = -1 / line.slope;
  const tauSigma = line.slopeSigma / (line.slope * line.slope);
  // f0's own uncertainty is parts per million of it; τ's dominates Q's.
  return {
    ...out,
    decayTauS: tau,
    decayTauSigmaS: tauSigma,
    q: Math.PI * frequencyHz * tau,
    qSigma: Math.PI * frequencyHz * tauSigma,
    settledVpk: Math.exp(line.intercept),
  };
}

function thin(t: number[], a: Float64Array): { timeS: number[]; amplitudeVpk: number[] } | null {
  if (a.length === 0) return null;
  const per = Math.max(1, Math.ceil(a.length / CURVE_POINTS));
  const timeS: number[] = [];
  const amplitudeVpk: number[] = [];
  for (let first = 0; first < a.length; first += per) {
    const last = Math.min(a.length, first + per);
    timeS.push((t[first] + t[last - 1]) / 2);
    amplitudeVpk.push(mean(a, first, last));
  }
  return { timeS, amplitudeVpk };
}
