import { z } from "zod";
import { RUN_STATUSES } from "@/db/queries/runs";
import { booleanField, idSchema, optionalNumberField, optionalText, optionalTimeField, pageQuerySchema } from "./common";

/** File name endings and content types accepted as a capture (the content is checked by the importer). */
export const CAPTURE_EXTENSIONS = [".csv", ".txt", ".tsv"] as const;
export const CAPTURE_CONTENT_TYPES = ["text/csv", "text/plain", "text/tab-separated-values", "application/vnd.ms-excel", "application/csv", "application/octet-stream", ""] as const;

/** Probe attenuation written as 10, "10x", "x10" or "10:1". */
const probeField = z.preprocess(
  (v) => {
    if (v === undefined || v === null || (typeof v === "string" && v.trim() === "")) return undefined;
    if (typeof v !== "string") return v;
    const m = /^\s*(?:x\s*)?(\d+(?:\.\d+)?)\s*(?:x|:\s*1)?\s*$/i.exec(v);
    return m ? Number(m[1]) : v;
  },
  z
    .number({ error: "The probe attenuation is a number such as 1, 10 or 100 (10x, 10:1)." })
    .min(1, "The probe attenuation is at least 1 (1x).")
    .max(10_000, "The probe attenuation is at most 10000.")
    .optional(),
);

/**
 * What a technician says about a capture when logging it. Field names match the API's multipart fields:
 * channel, probe, supplyV, temperatureC, note, tweakId; keepDuplicate confirms a second copy of a file already logged.
 */
export const runMetadataSchema = z.object({
  channel: optionalText(100, "The channel"),
  probe: probeField.transform((v) => v ?? 1),
  supplyV: optionalNumberField("The supply voltage", { min: -1000, max: 1000 }),
  temperatureC: optionalNumberField("The temperature (°C)", { min: -80, max: 300 }),
  note: optionalText(2000, "The note").transform((v) => v ?? ""),
  tweakId: z.preprocess((v) => (v === "" || v === null ? undefined : v), idSchema.optional()),
  keepDuplicate: booleanField.default(false),
});
export type RunMetadata = z.output<typeof runMetadataSchema>;

/** Ask for a presigned upload slot for a capture. The size limit (UPLOAD_LIMIT_BYTES) is checked by the service (413). */
export const uploadSlotRequestSchema = z.object({
  buildId: idSchema,
  filename: z.string({ error: "The file has no name." }).trim().min(1, "The file has no name.").max(255, "The file name is too long (255 characters at most)."),
  sizeBytes: z.number({ error: "The file size is missing." }).int("The file size is a whole number of bytes.").min(1, "The file is empty."),
  contentType: z.string().trim().max(200).optional().transform((v) => v ?? ""),
});
export type UploadSlotRequest = z.output<typeof uploadSlotRequestSchema>;

/** Finish a presigned upload: the run's details. */
export const uploadCompleteSchema = runMetadataSchema;

export const runListQuerySchema = pageQuerySchema.extend({
  verdict: z.preprocess((v) => (v === "" ? undefined : v), z.enum(["pass", "fail", "inconclusive", "none"], { error: "verdict is pass, fail, inconclusive or none." }).optional()),
  status: z.preprocess((v) => (v === "" ? undefined : v), z.enum(RUN_STATUSES, { error: `status is one of ${RUN_STATUSES.join(", ")}.` }).optional()),
  from: optionalTimeField("from"),
  to: optionalTimeField("to"),
});

/** An Idempotency-Key header: 1–200 visible ASCII characters. */
export const idempotencyKeySchema = z.string().trim().regex(/^[\x21-\x7e]{1,200}$/, "Idempotency-Key must be 1 to 200 visible ASCII characters.");
