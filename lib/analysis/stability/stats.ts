/**
 * χ²_p(ν) by Wilson & Hilferty's (1931) cube-root normal approximation, z the standard normal
 * quantile of p: ν·(1 − 2/(9ν) + z·√(2/(9ν)))³, good to a percent or so from ν ≈ 3 up.
 */
export function chiSquareQuantile(dof: number, z: number): number {
  const a = 2 / (9 * dof);
  return dof * Math.max(1e-12, 1 - a + z * Math.sqrt(a)) ** 3;
}
