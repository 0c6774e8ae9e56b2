import { z } from "zod";
import { documented } from "../documented";

// The engine's result object (lib/analysis AnalysisResult): the same object, with the same field names, that
// `npm run -s analyze -- FILE --json` prints. SI units (Hz, V, s); dB where named; a dB figure that would be
// infinite is null.

const harmonicSchema = z.object({
  order: z.int().min(2),
  frequencyHz: z.number(),
  amplitudeVpk: z.number(),
  dBc: z.number().nullable().describe("Level relative to the fundamental, dB."),
});

const spurSchema = z.object({
  frequencyHz: z.number(),
  amplitudeVpk: z.number(),
  dBc: z.number().nullable(),
  kind: z.enum(["harmonic", "other"]),
});

const warningSchema = z.object({
  code: z.string().describe("Stable code for programs: clipping, not-steady, few-cycles, low-oversampling, in-record-drift."),
  message: z.string().describe("A plain sentence for people."),
});

const twoChannelSchema = z.object({
  gainDb: z.number(),
  phaseDeg: z.number().describe("Phase of the other channel minus the reference's, degrees in (−180, 180]."),
  referenceVpk: z.number(),
  otherVpk: z.number(),
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
      frequencyUncertaintyHz: z.number().describe("1-sigma uncertainty of frequencyHz, Hz."),
      fundamentalVpk: z.number(),
      fundamentalPhaseRad: z.number(),
      vpp: z.number(),
      vrms: z.number().describe("Total rms, DC included, V."),
      dcV: z.number(),
      meanV: z.number(),
      minV: z.number(),
      maxV: z.number(),
      thdPercent: z.number().describe("THD relative to the fundamental, %."),
      thdDb: z.number().nullable(),
      thdRPercent: z.number().describe("THD relative to the total rms of fundamental and harmonics, %."),
      sinadDb: z.number().nullable(),
      snrDb: z.number().nullable(),
      sfdrDb: z.number().nullable(),
      enob: z.number().nullable(),
      noiseVrms: z.number(),
      harmonicOrdersRequested: z.int(),
      harmonics: z.array(harmonicSchema),
      largestSpur: spurSchema.nullable(),
      cycles: z.number(),
      samplesPerCycle: z.number(),
      warnings: z.array(warningSchema),
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
