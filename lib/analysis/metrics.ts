/**
 * Figures of merit as IEEE Std 1241-2010 and IEEE Std 1057-2017 define them, from amplitudes and
 * rms values. All ratios are amplitude ratios; dB values are 20·log10 of them.
 */

/** 20·log10 of an amplitude ratio; −Infinity for 0. */
export function amplitudeRatioToDb(ratio: number): number {
  return 20 * Math.log10(ratio);
}

/**
 * Total harmonic distortion relative to the fundamental, THD_F = √(Σ V_h²) / V_1 (IEEE Std 1241;
 * IEC's usage of "THD").
 *
 * @param fundamental - amplitude of the fundamental (any unit, peak or rms alike)
 * @param harmonics - amplitudes of the harmonics counted, same unit
 * @returns the ratio (multiply by 100 for %)
 * @throws RangeError when the fundamental is not positive
 */
export function thdRatio(fundamental: number, harmonics: readonly number[]): number {
  if (!(fundamental > 0)) throw new RangeError(`fundamental amplitude must be positive, got ${fundamental}`);
  let sum = 0;
  for (const h of harmonics) sum += h * h;
  return Math.sqrt(sum) / fundamental;
}

/** THD relative to the total rms of all the harmonics including the fundamental: THD_F/√(1+THD_F²). */
export function thdFToThdR(thdF: number): number {
  return thdF / Math.sqrt(1 + thdF * thdF);
}

/**
 * Signal to noise and distortion, SINAD = rms signal / rms(noise + distortion), DC excluded.
 * @param signalRms - rms of the fundamental
 * @param noiseAndDistortionRms - rms of everything else but DC
 * @returns SINAD in dB
 */
export function sinadDb(signalRms: number, noiseAndDistortionRms: number): number {
  return amplitudeRatioToDb(signalRms / noiseAndDistortionRms);
}

/**
 * SINAD from SNR and THD, assuming noise and distortion are uncorrelated:
 * SINAD = −10·log10(10^(−SNR/10) + 10^(THD/10)).
 * @param snrDb - signal to noise, dB
 * @param thdDbc - THD in dB relative to the carrier (negative)
 */
export function sinadFromSnrAndThdDb(snrDb: number, thdDbc: number): number {
  return -10 * Math.log10(10 ** (-snrDb / 10) + 10 ** (thdDbc / 10));
}

/**
 * Effective number of bits of a full-scale sine, ENOB = (SINAD − 1.76)/6.02 (IEEE Std 1241,
 * from the ideal quantizer's SNR = 6.02·N + 1.76 dB). For a sine below full scale it reads low
 * by the back-off in dB / 6.02.
 * @param sinad - SINAD in dB
 */
export function enobFromSinadDb(sinad: number): number {
  return (sinad - 1.76) / 6.02;
}

/**
 * Spurious-free dynamic range, fundamental over the largest spur (harmonic or not), in dBc.
 * @param fundamental - amplitude of the fundamental
 * @param largestSpur - amplitude of the largest other spectral component, same unit
 */
export function sfdrDb(fundamental: number, largestSpur: number): number {
  return amplitudeRatioToDb(fundamental / largestSpur);
}
