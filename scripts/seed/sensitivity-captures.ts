// Captures for the sensitivity demo: steady records whose frequency follows a planted pushing and tempco, and one
// start-up record whose envelope grows exponentially and then settles. Seeded, so every seed writes the same bytes.
import { SeededRandom, synthCaptureCsv } from "../lib/synth-capture";

/** The planted truth of the demo build (PCB-A2): what the Sensitivity card should find. */
export const PLANTED = Object.freeze({
  /** Frequency at 12 V and 23 °C, Hz. */
  referenceHz: 374_600,
  referenceSupplyV: 12,
  referenceTemperatureC: 23,
  /** Pushing, ppm/V. */
  pushingPpmPerV: -12,
  /** Temperature coefficient, ppm/K (an inductor core the design's parts do not describe). */
  tempcoPpmPerK: -45,
  /** Fundamental amplitude at 12 V, V peak, and its slope against supply, V/V. */
  amplitudeVpk: 0.9,
  amplitudePerV: 0.06,
});

/** The planted frequency at a supply and temperature, plus an offset in ppm (run-to-run wobble). */
export function plantedHz(supplyV: number, temperatureC: number, offsetPpm = 0): number {
  const p = PLANTED;
  return p.referenceHz * (1 + 1e-6 * (p.pushingPpmPerV * (supplyV - p.referenceSupplyV) + p.tempcoPpmPerK * (temperatureC - p.referenceTemperatureC) + offsetPpm));
}

/** The planted amplitude at a supply voltage, V peak. */
export function plantedVpk(supplyV: number): number {
  return PLANTED.amplitudeVpk + PLANTED.amplitudePerV * (supplyV - PLANTED.referenceSupplyV);
}

const SAMPLES = 20_000;
const NOISE_VRMS = 0.004;
const FULL_SCALE_V = 2;
const BITS = 8;
const PREAMBLE = { Instrument: "bench scope 2", "Record Length": String(SAMPLES) };

/** A steady capture as the bench scope writes it (8-bit, ±2 V, 25 samples per cycle), like the rest of the demo. */
export function steadyCapture(frequencyHz: number, amplitudeVpk: number, seed: number): Buffer {
  return Buffer.from(
    synthCaptureCsv({
      frequencyHz,
      sampleRateHz: Math.round(PLANTED.referenceHz * 25),
      samples: SAMPLES,
      amplitudeV: amplitudeVpk,
      harmonicsDbc: [-41, -48, -55],
      noiseVrms: NOISE_VRMS,
      quantizationBits: BITS,
      fullScaleV: FULL_SCALE_V,
      preamble: PREAMBLE,
      seed,
    }),
    "utf8",
  );
}

/**
 * A power-up capture: the envelope A/(1 + e^(−g(t − t₀))) grows as e^(g·t) while small (the loop gain above 1) and
 * settles at A once the transistor limits it. With g = 12 000 /s and t₀ = 0.5 ms it starts under the noise and
 * reaches 90 % of A at t₀ + ln 9 / g ≈ 0.68 ms, then stays settled for the rest of the 2.1 ms record.
 */
export function startUpCapture(frequencyHz: number, amplitudeVpk: number, seed: number, growthPerS = 12_000, midpointS = 5e-4): Buffer {
  const sampleRateHz = Math.round(PLANTED.referenceHz * 25);
  const random = new SeededRandom(seed);
  const step = (2 * FULL_SCALE_V) / 2 ** BITS;
  const lines = [...Object.entries(PREAMBLE).map(([k, v]) => `${k},${v}`), "Time (s),Out (V)"];
  for (let i = 0; i < SAMPLES; i++) {
    const t = i / sampleRateHz;
    const envelope = amplitudeVpk / (1 + Math.exp(-growthPerS * (t - midpointS)));
    const phase = 2 * Math.PI * frequencyHz * t + 0.3;
    const wave = Math.cos(phase) + 10 ** (-41 / 20) * Math.cos(2 * phase + 0.7) + 10 ** (-48 / 20) * Math.cos(3 * phase + 2.1);
    const v = Math.round((envelope * wave + NOISE_VRMS * random.normal()) / step) * step;
    lines.push(`${t.toExponential(9)},${v.toFixed(6)}`);
  }
  return Buffer.from(lines.join("\n") + "\n", "utf8");
}
