import { z } from "zod";
import { TOPOLOGIES } from "@/lib/oscillator";
import { documented } from "../documented";

// Pieces of the response shapes. These document what lib/logbook/api-json.ts writes; the integration tests parse
// real responses with them, so a field that changes there fails a test instead of silently leaving the document.

/** A time as the API writes it: ISO 8601 in UTC with a Z (Date.toJSON). */
export const isoTime = z.iso.datetime({ offset: false }).describe("ISO 8601 time in UTC, e.g. 2026-12-01T09:30:00.000Z.");
export const nullableIsoTime = isoTime.nullable();

/** Ids of logbook rows (projects, designs, builds, tweaks, runs, flags) are UUIDs. */
export const rowId = z.uuid();
/** Account ids are opaque strings (not UUIDs). */
export const userId = z.string().min(1).describe("An account id (opaque string).");

export const topologySchema = z.enum(TOPOLOGIES as unknown as [string, ...string[]]).describe("The oscillator topology.");

export const partSpecSchema = documented(
  z.object({
    valueSi: z.number().describe("Nominal value in SI units: F for capacitors, H for inductors and M, dimensionless for k."),
    tolerance: z.number().optional().describe("Symmetric tolerance as a fraction (0.05 = ±5 %)."),
    tempcoPpmPerK: z.number().optional().describe("Temperature coefficient, ppm/K."),
    tempcoSpreadPpmPerK: z.number().optional().describe("Half-width of the tempco's own tolerance, ppm/K."),
  }),
  { refId: "Part" },
);

export const partsSchema = z
  .record(z.string(), partSpecSchema)
  .describe("Parts by reference designator as the topology names them (C1, C2, L1, …).");

export const designSpecSchema = documented(
  z.object({
    targetHz: z.number().nullable().optional().describe("Target frequency, Hz."),
    toleranceValue: z.number().nullable().optional().describe("Half-width of the allowed window around the target, in toleranceUnit."),
    toleranceUnit: z.enum(["percent", "ppm"]).nullable().optional(),
    maxThdPercent: z.number().nullable().optional().describe("Largest allowed THD, %."),
    maxHarmonicDbc: z.number().nullable().optional().describe("Highest allowed level of any harmonic, dBc (negative)."),
    minFundamentalVpk: z.number().nullable().optional().describe("Smallest allowed fundamental amplitude, V peak."),
    maxDriftPpm: z.number().nullable().optional().describe("Largest allowed frequency change within one record, ppm."),
    maxRmsJitterS: z.number().nullable().optional().describe("Largest allowed rms phase jitter of a capture, s (forms also take \"50 ps\")."),
    maxPushingPpmPerV: z.number().nullable().optional().describe("Largest allowed |pushing| of the build as it stands, ppm/V (judged across runs)."),
    maxTempcoPpmPerK: z.number().nullable().optional().describe("Largest allowed |temperature coefficient| of the build as it stands, ppm/K (judged across runs)."),
    phaseNoiseOffsetHz: z.number().nullable().optional().describe("Offset from the carrier where phase noise is judged, Hz; set together with maxPhaseNoiseDbcPerHz."),
    maxPhaseNoiseDbcPerHz: z.number().nullable().optional().describe("Highest allowed phase noise at phaseNoiseOffsetHz, dBc/Hz; judged only from a measured point there."),
    maxStartUpS: z.number().nullable().optional().describe("Longest allowed start-up time (first visible oscillation to 90 % of the settled amplitude), s."),
  }),
  { refId: "Spec", description: "A design's spec; a limit left null is not checked." },
);

const bandSchema = z.object({ minHz: z.number(), maxHz: z.number() });

export const predictionSchema = documented(
  z.object({
    predictedHz: z.number().describe("Predicted oscillation frequency, Hz."),
    cEffF: z.number().describe("Effective tank capacitance, F."),
    lEffH: z.number().describe("Effective tank inductance, H."),
    feedbackFraction: z.number().nullable(),
    minGain: z.number().nullable(),
    extraCapacitanceF: z.number().describe("Stray/extra capacitance included in the prediction, F."),
    assumptions: z.string(),
    worstCase: bandSchema.describe("Frequency band with every part at a tolerance corner, Hz."),
    statistical: bandSchema
      .extend({ meanHz: z.number(), stdDevHz: z.number() })
      .describe("99.7 % band of a seeded Monte Carlo over the tolerances, Hz."),
  }),
  { refId: "Prediction" },
);

export const flagSchema = documented(
  z.object({
    id: rowId,
    rule: z.string().describe("The spec rule broken: frequency, thd, harmonic-<n>, amplitude, in-record-drift, warning-<code>."),
    measured: z.number().nullable(),
    limit: z.number().nullable(),
    margin: z.number().nullable().describe("Positive inside the limit, negative outside, in unit."),
    unit: z.string(),
    message: z.string(),
    acknowledgedAt: nullableIsoTime,
    acknowledgedByName: z.string().nullable(),
  }),
  { refId: "Flag", description: "A spec rule a run broke." },
);

/**
 * The list envelope: `{items, nextCursor}`. `nextCursor` is null on the last page; pass it back as `?cursor=`.
 * @param item - the schema of one item
 * @param refId - component name of the page, e.g. "ProjectPage"
 */
export function pageOf<T extends z.ZodType>(item: T, refId: string) {
  return documented(
    z.object({
      items: z.array(item),
      nextCursor: z.string().nullable().describe("Opaque cursor of the next page; null on the last page."),
    }),
    { refId },
  );
}
