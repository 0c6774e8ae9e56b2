import type { PhaseResidual } from "./demodulate";
import { floorMargin } from "./stats";

export { floorMargin };
import { bandIntegral, bandMean, bandWhiteLevel, detrend, hannPsd, type OneSidedPsd } from "./psd";
import type { PhaseNoiseFloor, PhaseNoisePoint, StabilityJitter, StabilityPhaseNoise } from "./types";

const CURVE_BANDS_PER_DECADE = 10;

function db(x: number): number {
  return 10 * Math.log10(Math.max(x, 1e-300));
}

/** Inputs of {@link phaseNoiseAndJitter}. */
export interface PhaseNoiseInputs {
  residual: PhaseResidual;
  frequencyHz: number;
  sampleRateHz: number;
  amplitudeVpk: number;
  /** The record's code step, volts, when it has one. */
  quantizationStepV?: number;
  /** Highest offset to report and integrate, Hz (capped at fs/2 and at a quarter of f0). */
  upperOffsetHz?: number;
}

/** The PM and AM densities of a phase residual: S_φ(f) in rad²/Hz and the fractional-amplitude density in 1/Hz. */
export function residualDensities(residual: PhaseResidual, amplitudeVpk: number): { pm: OneSidedPsd; am: OneSidedPsd } {
  const am = new Float64Array(residual.amplitudeVpk.length);
  for (let k = 0; k < am.length; k++) am[k] = residual.amplitudeVpk[k] / amplitudeVpk - 1;
  return { pm: hannPsd(detrend(residual.phaseRad), residual.blockRateHz), am: hannPsd(detrend(am), residual.blockRateHz) };
}

/** The offset band the record supports: 1/T up to the lowest of fs/2, f0/4 and the caller's limit. */
export function offsetBand(recordS: number, frequencyHz: number, sampleRateHz: number, upperOffsetHz?: number): { lowHz: number; highHz: number } {
  // Beyond a quarter of the carrier the one-period average droops by more than 0.9 dB (sinc at ¼)
  // and the lower sideband nears the half-carrier region where the harmonics' sidebands meet it.
  const highHz = Math.min(sampleRateHz / 2, frequencyHz / 4, upperOffsetHz ?? Infinity);
  return { lowHz: 1 / recordS, highHz };
}

/**
 * Single-sideband phase noise 𝓛(f) = S_φ(f)/2 (IEEE Std 2414-2020, 𝓛 defined as half the one-sided
 * phase PSD) at decade offsets and on a tenth-decade curve, the floor the capture's additive noise
 * and quantization set, and the rms phase jitter φ_rms = √(2∫𝓛 df) with σ_t = φ_rms/(2πf0) over the
 * band the record supports (IEEE Std 2414-2020's relation of integrated phase noise to rms jitter).
 *
 * The floor: additive white noise of σ² per sample splits evenly into AM and PM, each with
 * 𝓛 = 2σ²/(A²·fs) (REFERENCES.md, phase noise and jitter), so the residual's AM density at the
 * upper half of the band (its median, so a spur there does not lift it) measures it without the
 * oscillator's own phase noise in it; a code step q
 * adds q²/12 per sample, and the floor is the larger of the two.
 */
export function phaseNoiseAndJitter(inputs: PhaseNoiseInputs): { phaseNoise: StabilityPhaseNoise; jitter: StabilityJitter; additiveNoiseVrms: number } {
  const { residual, frequencyHz, sampleRateHz, amplitudeVpk } = inputs;
  const recordS = (residual.phaseRad.length * residual.blockSamples) / sampleRateHz;
  const { lowHz, highHz } = offsetBand(recordS, frequencyHz, sampleRateHz, inputs.upperOffsetHz);
  const { pm, am } = residualDensities(residual, amplitudeVpk);

  const floorBand = bandWhiteLevel(am, highHz / 2, highHz) ?? bandWhiteLevel(am, lowHz, highHz);
  // White additive noise: 𝓛 = S_AM/2 per the even split; σ² = 𝓛·A²·fs/2 per sample.
  const additiveL = (floorBand?.mean ?? 0) / 2;
  const step = inputs.quantizationStepV;
  const quantizationL = step !== undefined ? (2 * (step * step) / 12) / (amplitudeVpk * amplitudeVpk * sampleRateHz) : null;
  const floorL = Math.max(additiveL, quantizationL ?? 0);
  const floorDof = floorBand?.dof ?? 2;
  const floor: PhaseNoiseFloor = {
    dbcPerHz: db(floorL),
    additiveDbcPerHz: db(additiveL),
    quantizationDbcPerHz: quantizationL === null ? null : db(quantizationL),
    quantizationStepV: step ?? null,
    additiveNoiseVrms: Math.sqrt((floorL * amplitudeVpk * amplitudeVpk * sampleRateHz) / 2),
  };
  // The floor's own scatter widens the margin as the estimate's does.
  const marginFor = (dof: number) => floorMargin(1 / (1 / dof + 1 / floorDof));

  const points: PhaseNoisePoint[] = [];
  for (let decade = Math.ceil(Math.log10(lowHz)); 10 ** decade <= highHz * (1 + 1e-9); decade++) {
    const offsetHz = 10 ** decade;
    const half = 10 ** (0.5 / CURVE_BANDS_PER_DECADE);
    let band = bandMean(pm, offsetHz / half, offsetHz * half);
    // A decade below 10/T falls between bins of a tenth-decade band: take the nearest bin within ±25 %.
    if (!band) {
      const k = Math.round(offsetHz / pm.binHz);
      if (k >= 1 && Math.abs(k * pm.binHz - offsetHz) <= 0.25 * offsetHz) band = bandMean(pm, k * pm.binHz, k * pm.binHz);
    }
    if (!band) continue;
    const estimateL = band.mean / 2;
    const atFloor = estimateL < floorL * marginFor(band.dof);
    points.push({
      offsetHz,
      dbcPerHz: db(atFloor ? floorL : estimateL),
      estimateDbcPerHz: db(estimateL),
      floorDbcPerHz: floor.dbcPerHz,
      atFloor,
      dof: band.dof,
    });
  }

  const curve = { offsetHz: [] as number[], dbcPerHz: [] as number[], floorDbcPerHz: [] as number[], atFloor: [] as boolean[] };
  const firstBand = Math.floor(Math.log10(lowHz) * CURVE_BANDS_PER_DECADE);
  const lastBand = Math.ceil(Math.log10(highHz) * CURVE_BANDS_PER_DECADE);
  for (let b = firstBand; b < lastBand; b++) {
    const lo = Math.max(lowHz, 10 ** (b / CURVE_BANDS_PER_DECADE));
    const hi = Math.min(highHz, 10 ** ((b + 1) / CURVE_BANDS_PER_DECADE));
    const band = hi > lo ? bandMean(pm, lo, hi) : undefined;
    if (!band) continue;
    const estimateL = band.mean / 2;
    curve.offsetHz.push(Math.sqrt(lo * hi));
    curve.dbcPerHz.push(db(estimateL));
    curve.floorDbcPerHz.push(floor.dbcPerHz);
    curve.atFloor.push(estimateL < floorL * marginFor(band.dof));
  }

  const measured = bandIntegral(pm, lowHz, highHz);
  const floorIntegral = floorL * 2 * measured.bins * pm.binHz;
  const atFloor = measured.integral < floorIntegral * marginFor(measured.dof);
  const phaseRms = Math.sqrt(atFloor ? floorIntegral : measured.integral);
  const toSeconds = 1 / (2 * Math.PI * frequencyHz);
  const jitter: StabilityJitter = {
    rmsPhaseRad: phaseRms,
    rmsJitterS: phaseRms * toSeconds,
    bandLowHz: lowHz,
    bandHighHz: highHz,
    atFloor,
    floorRmsPhaseRad: Math.sqrt(floorIntegral),
    floorRmsJitterS: Math.sqrt(floorIntegral) * toSeconds,
    reason: null,
  };
  return {
    phaseNoise: { points, curve: curve.offsetHz.length > 0 ? curve : null, floor, reason: null },
    jitter,
    additiveNoiseVrms: floor.additiveNoiseVrms,
  };
}
