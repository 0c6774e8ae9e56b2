/** The fitted tone a record is demodulated against: y[n] ≈ offsetV + amplitudeV·cos(ω·n + phaseRad). */
export interface ReferenceTone {
  omegaRadPerSample: number;
  amplitudeV: number;
  phaseRad: number;
  offsetV: number;
}

/** The record's complex envelope against the fitted tone, one value per averaging block. */
export interface PhaseResidual {
  /** Samples per block (the period rounded to whole samples). */
  blockSamples: number;
  /** Block rate fs / blockSamples, Hz. */
  blockRateHz: number;
  /** Phase of each block against the fitted tone, radians, unwrapped. */
  phaseRad: Float64Array;
  /** Amplitude of the fundamental in each block, V peak. */
  amplitudeVpk: Float64Array;
}

// The rotation recurrence drifts by about one ulp a step: restart from exact values every 2048 samples.
const RESYNC_MASK = 2047;

/**
 * Demodulates the record against the fitted tone: z[n] = r[n]·e^{−j(ωn+φ)} with r the residual
 * after the fitted tone, averaged over blocks of one period (rounded to whole samples), plus A/2.
 * Taking the tone out before mixing removes its image at 2ω exactly, so only the residual's own
 * image (noise-sized, and near a null of the one-period average) is left; the same average nulls
 * the harmonics' sidebands, which the mixing moves to multiples of f0.
 *
 * For a small phase deviation δ, y ≈ A cos(θ) − A·δ·sin(θ), so −2·⟨r·sin θ⟩ = A·δ: the block phase is
 * atan2(−2⟨r sin θ⟩, A + 2⟨r cos θ⟩) and stays right for deviations up to ±π (then unwrapped).
 *
 * @param y - the record with harmonics removed (volts)
 * @param tone - the fitted fundamental
 * @returns block phases and amplitudes; empty when the record holds under one block
 */
export function demodulatePhase(y: Float64Array, tone: ReferenceTone, sampleRateHz: number): PhaseResidual {
  const { omegaRadPerSample: omega, amplitudeV: amplitude, phaseRad: phase0, offsetV: offset } = tone;
  const blockSamples = Math.max(1, Math.round((2 * Math.PI) / omega));
  const blocks = Math.floor(y.length / blockSamples);
  const phaseRad = new Float64Array(blocks);
  const amplitudeVpk = new Float64Array(blocks);
  const rotCos = Math.cos(omega);
  const rotSin = Math.sin(omega);
  const mask = RESYNC_MASK;
  let c = 0;
  let s = 0;
  let n = 0;
  let previous = 0;
  for (let k = 0; k < blocks; k++) {
    let sumC = 0;
    let sumS = 0;
    const end = n + blockSamples;
    for (; n < end; n++) {
      if ((n & mask) === 0) {
        c = Math.cos(omega * n + phase0);
        s = Math.sin(omega * n + phase0);
      }
      const r = y[n] - offset - amplitude * c;
      sumC += r * c;
      sumS += r * s;
      const nextC = c * rotCos - s * rotSin;
      s = s * rotCos + c * rotSin;
      c = nextC;
    }
    const re = amplitude + (2 * sumC) / blockSamples;
    const im = (-2 * sumS) / blockSamples;
    let p = Math.atan2(im, re);
    // Unwrap against the previous block: a phase that wanders by more than π overall is followed.
    if (k > 0) p += 2 * Math.PI * Math.round((previous - p) / (2 * Math.PI));
    previous = p;
    phaseRad[k] = p;
    amplitudeVpk[k] = Math.hypot(re, im);
  }
  return { blockSamples, blockRateHz: sampleRateHz / blockSamples, phaseRad, amplitudeVpk };
}
