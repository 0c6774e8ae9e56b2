import { floorMargin } from "./stats";
import type { StabilityPeriodJitter } from "./types";

/** Fewer periods than this and an rms of them says little. */
export const MIN_PERIODS = 16;

/**
 * Rising zero crossings of a sine of known ω about `offsetV`, in fractional samples. Each crossing
 * is placed from the two samples around it as a sine would pass through them: with u = B·sin α and
 * v = B·sin(α + ω), α = atan2(u·sin ω, v − u·cos ω), exact for a clean sine at any samples-per-period
 * (linear interpolation is the limit for many samples per period). A hysteresis of `hysteresisV`
 * keeps noise near zero from counting one crossing twice.
 */
export function risingCrossings(y: Float64Array, omegaRadPerSample: number, offsetV: number, hysteresisV: number): Float64Array {
  const sinW = Math.sin(omegaRadPerSample);
  const cosW = Math.cos(omegaRadPerSample);
  const out: number[] = [];
  let armed = false;
  for (let n = 1; n < y.length; n++) {
    const v = y[n] - offsetV;
    if (v < -hysteresisV) armed = true;
    else if (armed && v >= 0) {
      const u = y[n - 1] - offsetV;
      if (u < 0) {
        const alpha = Math.atan2(u * sinW, v - u * cosW);
        out.push(n - 1 - alpha / omegaRadPerSample);
        armed = false;
      }
    }
  }
  return Float64Array.from(out);
}

/**
 * Period jitter (standard deviation of the periods) and cycle-to-cycle jitter (rms of the difference
 * of adjacent periods), IEEE Std 2414-2020 terms, from the fundamental's rising zero crossings.
 *
 * The floor: additive noise of σ per sample moves a linearly interpolated crossing by
 * σ·√(u² + (1−u)²)/slope for a crossing at fraction u between samples (derived; 2/3·σ²/slope² on
 * average over u, but a record with a near-whole number of samples a period keeps one u, anywhere
 * from ½ to 1 of it), so the floor is summed crossing by crossing from each one's own u: a period's
 * variance is v_i + v_{i+1}, a cycle-to-cycle difference's v_i + 4v_{i+1} + v_{i+2} (adjacent
 * crossings are a period apart, their noise independent).
 *
 * @param y - the record with harmonics removed (volts)
 * @param additiveNoiseVrms - the additive noise per sample (from the phase-noise floor)
 */
export function periodJitter(
  y: Float64Array,
  sampleRateHz: number,
  omegaRadPerSample: number,
  amplitudeVpk: number,
  offsetV: number,
  additiveNoiseVrms: number,
): StabilityPeriodJitter {
  const hysteresisV = Math.min(0.5 * amplitudeVpk, 4 * additiveNoiseVrms);
  const crossings = risingCrossings(y, omegaRadPerSample, offsetV, hysteresisV);
  const periods = crossings.length - 1;
  const empty: StabilityPeriodJitter = {
    periods: Math.max(0, periods),
    rmsPeriodJitterS: null,
    rmsCycleToCycleS: null,
    rmsPeriodJitterFraction: null,
    meanPeriodS: null,
    floorRmsPeriodJitterS: null,
    floorRmsCycleToCycleS: null,
    atFloor: false,
    reason: null,
  };
  if (periods < MIN_PERIODS) {
    return { ...empty, reason: `only ${Math.max(0, periods)} whole periods between rising zero crossings; at least ${MIN_PERIODS} are needed` };
  }
  const p = new Float64Array(periods);
  let mean = 0;
  for (let i = 0; i < periods; i++) {
    p[i] = (crossings[i + 1] - crossings[i]) / sampleRateHz;
    mean += p[i];
  }
  mean /= periods;
  let sumSquares = 0;
  let diffSquares = 0;
  for (let i = 0; i < periods; i++) {
    sumSquares += (p[i] - mean) ** 2;
    if (i > 0) diffSquares += (p[i] - p[i - 1]) ** 2;
  }
  const rmsPeriod = Math.sqrt(sumSquares / (periods - 1));
  const rmsC2c = Math.sqrt(diffSquares / (periods - 1));
  const slopeVPerSample = amplitudeVpk * omegaRadPerSample;
  const unitS2 = (additiveNoiseVrms / slopeVPerSample / sampleRateHz) ** 2;
  const v = new Float64Array(crossings.length);
  for (let i = 0; i < v.length; i++) {
    const u = crossings[i] - Math.floor(crossings[i]);
    v[i] = (u * u + (1 - u) * (1 - u)) * unitS2;
  }
  let periodFloorSum = 0;
  let c2cFloorSum = 0;
  for (let i = 0; i < periods; i++) {
    periodFloorSum += v[i] + v[i + 1];
    if (i + 2 < v.length) c2cFloorSum += v[i] + 4 * v[i + 1] + v[i + 2];
  }
  const floorPeriod = Math.sqrt(periodFloorSum / periods);
  const floorC2c = Math.sqrt(c2cFloorSum / Math.max(1, periods - 1));
  const atFloor = rmsPeriod * rmsPeriod < floorPeriod * floorPeriod * floorMargin(periods - 1);
  const reported = atFloor ? floorPeriod : rmsPeriod;
  return {
    periods,
    rmsPeriodJitterS: reported,
    rmsCycleToCycleS: atFloor ? floorC2c : rmsC2c,
    rmsPeriodJitterFraction: reported / mean,
    meanPeriodS: mean,
    floorRmsPeriodJitterS: floorPeriod,
    floorRmsCycleToCycleS: floorC2c,
    atFloor,
    reason: null,
  };
}
