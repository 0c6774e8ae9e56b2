/*
 * The two-term recurrence of a sampled sinusoid in Reinsch's form, for the Goertzel filter and the
 * sinusoid generator of the harmonic fit (harmonic-sums.ts), which run its steps in their own
 * loops (a call per sample would cost more than the step): the set-up and the reading of a chain.
 */

/**
 * The two-term recurrence x[k+1] = 2cos w·x[k] − x[k−1] in Reinsch's form, which keeps its
 * accuracy where cos w is near ±1 (the plain form loses digits as 1/sin w there: 100× at
 * w = 0.001): for cos w ≥ 0 it carries x and d[k] = x[k] − x[k−1], with d[k+1] = d[k] + λ·x[k],
 * λ = −4 sin²(w/2); below, d[k] = x[k] + x[k−1] with d[k+1] = λ·x[k] − d[k], λ = 4 cos²(w/2).
 * (Reinsch's modification of the Goertzel algorithm, as in Stoer & Bulirsch, Introduction to
 * Numerical Analysis, §2.3 — from memory; the tests check it against the direct sums.)
 */
export interface Recurrence {
  /** Whether cos w ≥ 0 (the difference form). */
  low: boolean;
  lambda: number;
  sinW: number;
  /** sin(w/2) or cos(w/2), for the exact first difference or sum. */
  halfW: number;
}

export function recurrence(w: number): Recurrence {
  const low = Math.cos(w) >= 0;
  const halfW = low ? Math.sin(w / 2) : Math.cos(w / 2);
  return { low, lambda: low ? -4 * halfW * halfW : 4 * halfW * halfW, sinW: Math.sin(w), halfW };
}

/**
 * Adds one Goertzel chain's result to the sums: the chain ran x over K samples whose centred
 * indices start at m0 and ended in state (q, d), q the last filter value. With q2 the one before
 * it, q − e^{−iw}·q2 is Σ x_k e^{iw(K−1−k)}; conjugated and turned by e^{iw(m0+K−1)} it is
 * Σ x_k e^{iw(m0+k)}, whose real and imaginary parts are the cos and sin sums.
 */
export function chainSums(q: number, d: number, r: Recurrence, w: number, m0: number, samples: number, out: Float64Array, at: number): void {
  // q − cos w·q2 from the carried difference or sum, without cancelling q against q2.
  const q2 = r.low ? q - d : d - q;
  const re = r.low ? d + 2 * r.halfW * r.halfW * q2 : d - 2 * r.halfW * r.halfW * q2;
  const im = -r.sinW * q2;
  const turn = w * (m0 + samples - 1);
  const tc = Math.cos(turn);
  const ts = Math.sin(turn);
  out[at] += re * tc - im * ts;
  out[at + 1] += re * ts + im * tc;
}

