/**
 * The chi-square distribution's upper tail, for "is this scatter larger than the stated uncertainties explain?".
 * Q(χ² | ν) = Γ(ν/2, χ²/2)/Γ(ν/2), the regularized upper incomplete gamma function, by its series below a + 1 and
 * its continued fraction above (the standard split; Press et al., "Numerical Recipes", §6.2, from memory).
 */

// Lanczos approximation of ln Γ(x) for x > 0 (g = 7, n = 9 coefficients; common practice, from memory).
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905,
  -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
];

/** ln Γ(x) for x > 0. */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError(`logGamma needs x above 0; got ${x}`);
  if (x < 0.5) return Math.log(Math.PI / Math.sin(Math.PI * x)) - logGamma(1 - x);
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (z + i);
  const t = z + 7.5;
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

function lowerSeries(a: number, x: number): number {
  let term = 1 / a;
  let sum = term;
  for (let n = 1; n < 1000; n++) {
    term *= x / (a + n);
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * 1e-15) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - logGamma(a));
}

function upperFraction(a: number, x: number): number {
  // Modified Lentz evaluation of the continued fraction for Γ(a, x).
  const tiny = 1e-300;
  let b = x + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 1000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-15) break;
  }
  return Math.exp(-x + a * Math.log(x) - logGamma(a)) * h;
}

/**
 * Probability that a chi-square variable with `degreesOfFreedom` exceeds `chiSquare` (the test's p-value).
 * @param chiSquare - ≥ 0
 * @param degreesOfFreedom - > 0
 * @returns a probability in [0, 1]
 * @throws RangeError on a negative χ² or a degree of freedom not above 0
 * @example chiSquareSurvival(3.841, 1) // ≈ 0.05
 */
export function chiSquareSurvival(chiSquare: number, degreesOfFreedom: number): number {
  if (!(chiSquare >= 0)) throw new RangeError(`chiSquare must be 0 or more; got ${chiSquare}`);
  if (!(degreesOfFreedom > 0)) throw new RangeError(`degreesOfFreedom must be above 0; got ${degreesOfFreedom}`);
  if (chiSquare === 0) return 1;
  const a = degreesOfFreedom / 2;
  const x = chiSquare / 2;
  const q = x < a + 1 ? 1 - lowerSeries(a, x) : upperFraction(a, x);
  return Math.min(1, Math.max(0, q));
}
