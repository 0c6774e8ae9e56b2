import { fitHarmonics, type HarmonicFit } from "./harmonic-fit";
import { amplitudeRatioToDb } from "./metrics";

/** The second channel's fundamental relative to the first's. */
export interface GainPhase {
  /** 20·log10(A_other / A_reference), dB. */
  gainDb: number;
  /** Phase of the other channel minus the reference's, degrees in (−180, 180]. */
  phaseDeg: number;
  referenceVpk: number;
  otherVpk: number;
}

/**
 * Gain and phase between two channels at the fundamental, for checking an oscillator loop's
 * phase condition (for example base against collector). Both channels are fitted with the same
 * harmonic least-squares model at the same frequency, so distortion does not pull the phase.
 *
 * @param reference - reference channel, volts
 * @param other - other channel, volts (same length and sampling)
 * @param sampleRateHz - sample rate in Hz
 * @param frequencyHz - the fundamental in Hz (from the reference's analysis)
 * @param harmonics - highest order in the fit (default 10)
 * @returns gain in dB and phase in degrees of `other` relative to `reference`
 * @throws RangeError when the channels differ in length or the reference has no fundamental
 */
export function gainPhaseAtFundamental(
  reference: Float64Array,
  other: Float64Array,
  sampleRateHz: number,
  frequencyHz: number,
  harmonics = 10,
): GainPhase {
  if (reference.length !== other.length) {
    throw new RangeError(`channels must have the same length, got ${reference.length} and ${other.length}`);
  }
  const omega = (2 * Math.PI * frequencyHz) / sampleRateHz;
  return gainPhaseFromFits(fitHarmonics(reference, omega, harmonics), fitHarmonics(other, omega, harmonics));
}

/**
 * Gain and phase of one harmonic fit's fundamental against another's; both fits must share the
 * frequency and the span (their phases refer to the span's centre).
 * @param a - fit of the reference channel
 * @param b - fit of the other channel
 * @throws RangeError when the reference has no fundamental
 */
export function gainPhaseFromFits(a: HarmonicFit, b: HarmonicFit): GainPhase {
  const referenceVpk = a.amplitudesVpk[0];
  const otherVpk = b.amplitudesVpk[0];
  if (!(referenceVpk > 0)) throw new RangeError(`reference channel has no fundamental at ${a.omegaRadPerSample} rad/sample`);
  let phaseDeg = ((b.centrePhasesRad[0] - a.centrePhasesRad[0]) * 180) / Math.PI;
  phaseDeg = ((phaseDeg % 360) + 360) % 360;
  if (phaseDeg > 180) phaseDeg -= 360;
  return { gainDb: amplitudeRatioToDb(otherVpk / referenceVpk), phaseDeg, referenceVpk, otherVpk };
}
