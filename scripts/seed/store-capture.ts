// One demo capture into storage and the analysis queue, the way an upload through the app would arrive.
import { randomUUID } from "node:crypto";
import type { z } from "zod";
import { registerRun } from "../../lib/logbook/runs";
import { captureObjectKey, putObject } from "../../lib/storage";
import { runMetadataSchema } from "../../lib/validations/run";

export interface SeedCapture {
  buildId: string;
  filename: string;
  body: Buffer;
  /** The upload form's fields, checked by the same schema the form's are. */
  meta: z.input<typeof runMetadataSchema>;
  /** Back-dated, so the demo's timeline reads like weeks of bench work. */
  createdAt: Date;
}

/** Stores the capture under a fresh run id and registers the run; returns the run id. */
export async function storeSeedCapture(technician: Parameters<typeof registerRun>[0], capture: SeedCapture): Promise<string> {
  const runId = randomUUID();
  const objectKey = captureObjectKey(runId);
  await putObject(objectKey, capture.body, "text/csv");
  await registerRun(technician, {
    runId,
    buildId: capture.buildId,
    objectKey,
    originalFilename: capture.filename,
    expectedSizeBytes: capture.body.length,
    meta: runMetadataSchema.parse(capture.meta),
    createdAt: capture.createdAt,
  });
  return runId;
}
