import { z } from "zod";

// The engine's per-capture stability figures (lib/analysis/stability StabilityResult), engine ≥ 1.3.0.
// A figure that cannot be measured is null with `reason` saying why; a value at its floor is the floor
// itself with atFloor true (read it as "≤").

const reason = z.string().nullable().describe("Why the figure is not measured; null when it is.");

const jitterSchema = z.object({
  rmsPhaseRad: z.number().nullable().describe("√(2∫𝓛(f)df) over [bandLowHz, bandHighHz], rad (IEEE Std 2414 relation); the floor when atFloor."),
  rmsJitterS: z.number().nullable().describe("rmsPhaseRad / (2π·f0), s."),
  bandLowHz: z.number().nullable().describe("1 / record length, Hz."),
  bandHighHz: z.number().nullable().describe("min(fs/2, f0/4), Hz."),
  atFloor: z.boolean().describe("The estimate does not stand clear of the capture's additive-noise and quantization floor."),
  floorRmsPhaseRad: z.number().nullable(),
  floorRmsJitterS: z.number().nullable(),
  reason,
});

const phaseNoisePointSchema = z.object({
  offsetHz: z.number(),
  dbcPerHz: z.number().describe("𝓛(f), dBc/Hz; the floor when atFloor (read as ≤ floor)."),
  estimateDbcPerHz: z.number().describe("The raw estimate (includes the floor's share), dBc/Hz."),
  floorDbcPerHz: z.number(),
  atFloor: z.boolean(),
  dof: z.number().describe("Approximate degrees of freedom of the estimate."),
});

const phaseNoiseSchema = z.object({
  points: z.array(phaseNoisePointSchema).describe("𝓛(f) at decade offsets inside the band."),
  curve: z
    .object({ offsetHz: z.array(z.number()), dbcPerHz: z.array(z.number()), floorDbcPerHz: z.array(z.number()), atFloor: z.array(z.boolean()) })
    .nullable()
    .describe("Tenth-decade curve for plotting."),
  floor: z
    .object({
      dbcPerHz: z.number(),
      additiveDbcPerHz: z.number(),
      quantizationDbcPerHz: z.number().nullable(),
      quantizationStepV: z.number().nullable(),
      additiveNoiseVrms: z.number(),
    })
    .nullable(),
  reason,
});

const periodJitterSchema = z.object({
  periods: z.int(),
  rmsPeriodJitterS: z.number().nullable().describe("Standard deviation of the periods between rising zero crossings, s."),
  rmsCycleToCycleS: z.number().nullable().describe("rms of the difference of adjacent periods, s."),
  rmsPeriodJitterFraction: z.number().nullable().describe("rmsPeriodJitterS / mean period."),
  meanPeriodS: z.number().nullable(),
  floorRmsPeriodJitterS: z.number().nullable(),
  floorRmsCycleToCycleS: z.number().nullable(),
  atFloor: z.boolean(),
  reason,
});

const allanSchema = z.object({
  points: z.array(
    z.object({
      tauS: z.number(),
      adev: z.number().describe("Overlapping Allan deviation (IEEE Std 1139, NIST SP 1065)."),
      lowerAdev: z.number().describe("68 % interval, lower end."),
      upperAdev: z.number(),
      averages: z.int().describe("Overlapping second differences summed."),
      edf: z.number(),
      floorAdev: z.number(),
      atFloor: z.boolean(),
    }),
  ),
  confidence: z.string().describe("How the interval was obtained."),
  reason,
});

const envelopeSchema = z.object({
  kind: z.enum(["steady", "start-up", "ring-down", "unknown"]),
  startUpS: z.number().nullable().describe("First visible oscillation to 90 % of the settled amplitude, s."),
  growthPerS: z.number().nullable().describe("Exponential growth rate of the small envelope, 1/s."),
  decayTauS: z.number().nullable().describe("Ring-down e-folding time, s."),
  decayTauSigmaS: z.number().nullable(),
  q: z.number().nullable().describe("π·f0·τ."),
  qSigma: z.number().nullable(),
  settledVpk: z.number().nullable(),
  curve: z.object({ timeS: z.array(z.number()), amplitudeVpk: z.array(z.number()) }).nullable().describe("Envelope per period, thinned; null when steady."),
  reason,
});

export const stabilitySchema = z.object({
  jitter: jitterSchema,
  phaseNoise: phaseNoiseSchema,
  periodJitter: periodJitterSchema,
  allan: allanSchema,
  envelope: envelopeSchema,
  method: z.record(z.string(), z.string()),
});
