import { chiSquareQuantile, floorMargin } from "./stats";
import type { AllanPoint } from "./types";

export { chiSquareQuantile };

/**
 * The phase is averaged over one period per block, which biases σ_y low at short τ: for white FM
 * the second difference of block means has variance (2τ − τ_b)/(2τ) of that of point phases
 * (derived), so from 8 blocks on σ_y is under 3 % low.
 */
export const MIN_ALLAN_BLOCKS = 8;

export const ALLAN_CONFIDENCE =
  "68 % chi-square interval with the white-FM equivalent degrees of freedom of overlapping ADEV (Howe, Allan & Barnes 1981, as tabulated in NIST SP 1065 §5.3.3 [memory]); chi-square quantiles by Wilson & Hilferty (1931)";

/** Equivalent degrees of freedom of an overlapping Allan variance for white FM, N phase points, averaging factor m (NIST SP 1065 [memory]). */
export function whiteFmEdf(phasePoints: number, m: number): number {
  const n = phasePoints;
  return ((3 * (n - 1)) / (2 * m) - (2 * (n - 2)) / n) * ((4 * m * m) / (4 * m * m + 5));
}

/**
 * Overlapping Allan deviation from phase-time samples x (seconds) spaced τ0 apart (IEEE Std
 * 1139-2008; NIST SP 1065 eq. for σ_y(τ) from phase data):
 * σ²_y(mτ0) = Σ_{j=0}^{N−2m−1} (x_{j+2m} − 2x_{j+m} + x_j)² / (2·(mτ0)²·(N − 2m)),
 * at octave-spaced m from `minM` up to N/4 (at least two independent second differences).
 * `floorTimeErrorS` is the rms time error the additive noise puts on each sample; independent
 * samples give white PM, σ_y = √3·σ_x/τ (derived: E(x_{j+2m} − 2x_{j+m} + x_j)² = 6σ_x²).
 */
export function overlappingAllan(x: Float64Array, tau0S: number, minM = 1, floorTimeErrorS = 0): AllanPoint[] {
  const n = x.length;
  const points: AllanPoint[] = [];
  for (let m = minM; 4 * m <= n - 1; m *= 2) {
    const terms = n - 2 * m;
    let sum = 0;
    for (let j = 0; j < terms; j++) {
      const d = x[j + 2 * m] - 2 * x[j + m] + x[j];
      sum += d * d;
    }
    const tauS = m * tau0S;
    const adev = Math.sqrt(sum / (2 * tauS * tauS * terms));
    const edf = Math.max(1, whiteFmEdf(n, m));
    const floorAdev = (Math.sqrt(3) * floorTimeErrorS) / tauS;
    points.push({
      tauS,
      adev,
      lowerAdev: adev * Math.sqrt(edf / chiSquareQuantile(edf, 1)),
      upperAdev: adev * Math.sqrt(edf / chiSquareQuantile(edf, -1)),
      averages: terms,
      edf,
      floorAdev,
      atFloor: adev * adev < floorAdev * floorAdev * floorMargin(edf),
    });
  }
  return points;
}
