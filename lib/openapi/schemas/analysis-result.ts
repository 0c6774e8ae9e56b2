import { z } from "zod";
import { documented } from "../documented";
import { stabilitySchema } from "./stability";

// The engine's result object (lib/analysis AnalysisResult): the same object, with the same field names, that
// `npm run -s analyze -- FILE --json` prints. SI units (Hz, V, s); dB where named; a dB figure that would be
// infinite is null.

// Fields marked "1.2" are absent on results stored by engine versions before 1.2.0.
const harmonicSchema = z.object({
  order: z.int().min(2),
  frequencyHz: z.number().describe("order × fundamental, Hz."),
  seenAtHz: z.number().optional().describe("1.2: where the record shows it, |order·f − k·fs| folded into [0, fs/2], Hz."),
  folded: z.boolean().optional().describe("1.2: true when order·f is above half the sample rate (fitted at its folded frequency)."),
  status: z
    .enum(["measured", "below-detection", "not-separable"])
    .optional()
    .describe("1.2: measured; below-detection (under the noise: only detectionLimitDbc is known); not-separable (its fold lands on DC, Nyquist, the fundamental or another order)."),
  amplitudeVpk: z.number().nullable().describe("Fitted peak amplitude, V; null unless measured."),
  dBc: z.number().nullable().describe("Level relative to the fundamental, dB; null unless measured."),
  detectionLimitDbc: z.number().nullable().optional().describe("1.2: smallest level the record could tell from its noise (4σ of a fitted amplitude), dBc."),
  note: z.string().nullable().optional().describe("1.2: why the order has no level."),
});

const spurSchema = z.object({
  frequencyHz: z.number().describe("Where the record shows it, Hz."),
  amplitudeVpk: z.number(),
  dBc: z.number().nullable(),
  kind: z.enum(["harmonic", "sub-harmonic", "second-mode", "mains", "intermodulation", "other"]),
  label: z.string().optional().describe("1.2: which component it is: harmonic 3, f/2, 50 Hz mains × 3, f1 − f2…"),
});

const thdSchema = z.object({
  status: z.enum(["measured", "below-floor", "not-measurable"]),
  floorPercent: z.number().describe("What the orders under the noise could add at most, %."),
  upperBoundPercent: z.number().nullable().describe("√(THD² + floor²): the upper bound the record supports, %."),
  detectedOrders: z.array(z.int()),
  note: z.string().nullable(),
  neededSampleRateHz: z.number().nullable().describe("A sample rate that keeps every requested order apart, S/s; null when this one does."),
});

const uncertaintySchema = z.object({
  whiteNoiseHz: z.number().describe("1σ from the fit residual, white additive noise, Hz."),
  frequencyNoiseHz: z.number().nullable().describe("1σ the oscillator's own frequency noise adds, from the segment scatter; null when the record is too short to split."),
  statisticalHz: z.number().describe("√(white² + frequency noise²), Hz: frequencyUncertaintyHz."),
  segments: z.int(),
  scatterRatio: z.number().nullable(),
});

const toneSchema = z.object({
  statistic: z.number(),
  threshold: z.number(),
  toneOverRestDb: z.number().nullable(),
  detected: z.boolean(),
  dominant: z.boolean(),
});

const warningSchema = z.object({
  code: z
    .string()
    .describe(
      "Stable code for programs: clipping, not-steady, few-cycles, low-oversampling, in-record-drift, no-dominant-tone, second-mode, sub-harmonic.",
    ),
  message: z.string().describe("A plain sentence for people."),
});

const twoChannelSchema = z.object({
  gainDb: z.number().nullable().describe("1.3.2: null, with `reason`, when the compared channel shows no tone at the fundamental above its noise."),
  phaseDeg: z.number().nullable().describe("Phase of the other channel minus the reference's, degrees in (−180, 180]; null as gainDb."),
  referenceVpk: z.number(),
  otherVpk: z.number().describe("The compared channel's fitted amplitude at the fundamental, also when under its noise."),
  otherDetectionLimitVpk: z.number().optional().describe("1.3.2: the smallest amplitude the compared channel's noise lets a fit tell apart (4σ)."),
  reason: z.string().nullable().optional().describe("1.3.2: why gain and phase are not measured; null when they are."),
  referenceChannel: z.string(),
  channel: z.string(),
});

export const analysisResultSchema = documented(
  z
    .object({
      engineVersion: z.string(),
      channel: z.string().describe("The analysed channel."),
      samples: z.int(),
      sampleRateHz: z.number(),
      recordS: z.number(),
      frequencyHz: z.number().describe("Fundamental frequency from the four-parameter sine fit, Hz."),
      frequencyUncertaintyHz: z.number().describe("Statistical 1σ of frequencyHz (white noise and the oscillator's frequency noise; not the scope's timebase), Hz."),
      uncertainty: uncertaintySchema.optional().describe("1.2: where frequencyUncertaintyHz comes from."),
      fundamentalVpk: z.number(),
      fundamentalPhaseRad: z.number(),
      vpp: z.number(),
      vrms: z.number().describe("Total rms, DC included, V."),
      dcV: z.number(),
      meanV: z.number(),
      minV: z.number(),
      maxV: z.number(),
      thdPercent: z.number().nullable().describe("THD relative to the fundamental over the detected orders, %; null when not measurable or no order is above the noise (see thd)."),
      thdDb: z.number().nullable(),
      thdRPercent: z.number().nullable().describe("THD relative to the total rms of fundamental and harmonics, %."),
      thd: thdSchema.optional().describe("1.2: how THD came out, its noise floor and why it may be missing."),
      sinadDb: z.number().nullable(),
      snrDb: z.number().nullable(),
      sfdrDb: z.number().nullable(),
      enob: z.number().nullable(),
      noiseVrms: z.number(),
      harmonicOrdersRequested: z.int(),
      harmonics: z.array(harmonicSchema),
      spurs: z
        .array(spurSchema)
        .optional()
        .describe("1.2: the largest components besides the fundamental and the measured harmonics, named; 1.3.2: harmonics above the orders asked for are named so (kind harmonic), not a second mode."),
      largestSpur: spurSchema.nullable().describe("The component SFDR is measured against."),
      tone: toneSchema.optional().describe("1.2: whether the fitted tone stands above the rest of the record."),
      cycles: z.number(),
      samplesPerCycle: z.number(),
      warnings: z.array(warningSchema),
      stability: stabilitySchema.optional().describe("1.3: phase noise, jitter, period jitter, Allan deviation, start-up or ring-down; absent on results of older engines (not measured)."),
      twoChannel: twoChannelSchema.nullable(),
      metadata: z.record(z.string(), z.string()).describe("The capture file's preamble lines."),
      channels: z.array(z.string()).describe("Voltage channels the file holds."),
      timeSource: z.string().describe("Where the time axis came from: time-column, preamble or samples."),
      method: z.record(z.string(), z.string()).describe("How each figure was obtained."),
    })
    .loose(),
  {
    refId: "AnalysisResult",
    description: "What `npm run -s analyze -- FILE --json` prints for the same file: same field names, same values.",
  },
);
