/**
 * χ²_p(ν) by Wilson & Hilferty's (1931) cube-root normal approximation, z the standard normal
 * quantile of p: ν·(1 − 2/(9ν) + z·√(2/(9ν)))³, good to a percent or so from ν ≈ 3 up.
 */
export function chiSquareQuantile(dof: number, z: number): number {
  const a = 2 / (9 * dof);
  return dof * Math.max(1e-12, 1 - a + z * Math.sqrt(a)) ** 3;
}

const FLOOR_Z = 3.72;

/**
 * An estimate is told from the floor only when it stands above it by more than chance allows: the
 * 1 − 10⁻⁴ quantile of a ν-dof chi-square mean (z = 3.72), so a clean record's ~40 curve points
 * show a false "measured" one in well under 1 % of records; never by less than 1 dB, the allowance
 * for the floor's model (white, split evenly between AM and PM).
 */
export function floorMargin(dof: number): number {
  const nu = Math.max(1, dof);
  return Math.max(10 ** 0.1, chiSquareQuantile(nu, FLOOR_Z) / nu);
}
