import { fitHarmonics, type HarmonicFit, residualVariance } from "./harmonic-fit";
import { detectionLimitVpk } from "./harmonic-report";
import { amplitudeRatioToDb } from "./metrics";

/** The second channel's fundamental relative to the first's. */
export interface GainPhase {
  /** 20·log10(A_other / A_reference), dB; null when the other channel shows no tone there (see `reason`). */
  gainDb: number | null;
  /** Phase of the other channel minus the reference's, degrees in (−180, 180]; null as gainDb. */
  phaseDeg: number | null;
  referenceVpk: number;
  /** The other channel's fitted amplitude at the fundamental, even when it is under its noise. */
  otherVpk: number;
  /** The smallest amplitude the other channel's noise lets a fit tell apart there (4σ), volts. */
  otherDetectionLimitVpk: number;
  /** Why gain and phase are not measured; null when they are. */
  reason: string | null;
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
 * @returns gain in dB and phase in degrees of `other` relative to `reference`, or null with the
 *   reason when `other` shows no tone at the fundamental
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
 * frequency and the span (their phases refer to the span's centre). A phase is only a measurement
 * when the other channel's fundamental stands above its own noise, by the harmonics' detection rule
 * (4σ of a fitted amplitude, 3×10⁻⁴ false detections): a disconnected probe or a dead node reads
 * as noise, whose phase is any angle.
 * @param a - fit of the reference channel
 * @param b - fit of the other channel
 * @throws RangeError when the reference has no fundamental
 */
export function gainPhaseFromFits(a: HarmonicFit, b: HarmonicFit): GainPhase {
  const referenceVpk = a.amplitudesVpk[0];
  const otherVpk = b.amplitudesVpk[0];
  if (!(referenceVpk > 0)) throw new RangeError(`reference channel has no fundamental at ${a.omegaRadPerSample} rad/sample`);
  const otherDetectionLimitVpk = detectionLimitVpk(b, 0, residualVariance(b));
  if (!(otherVpk > otherDetectionLimitVpk)) {
    const reason =
      otherVpk > 0
        ? `the compared channel shows no tone at the fundamental: ${otherVpk.toExponential(2)} Vpk fitted, under its noise's detection limit of ${otherDetectionLimitVpk.toExponential(2)} Vpk (a loose probe or a dead node?)`
        : "the compared channel is flat: it holds no signal at the fundamental";
    return { gainDb: null, phaseDeg: null, referenceVpk, otherVpk, otherDetectionLimitVpk, reason };
  }
  let phaseDeg = ((b.centrePhasesRad[0] - a.centrePhasesRad[0]) * 180) / Math.PI;
  phaseDeg = ((phaseDeg % 360) + 360) % 360;
  if (phaseDeg > 180) phaseDeg -= 360;
  return { gainDb: amplitudeRatioToDb(otherVpk / referenceVpk), phaseDeg, referenceVpk, otherVpk, otherDetectionLimitVpk, reason: null };
}
