import { z } from "zod";

/** The most samples one excerpt holds: a screen's width of points several times over, never a whole record. */
export const EXCERPT_MAX_SAMPLES = 5000;

const seconds = (name: string) =>
  z.coerce.number({ error: `${name} is a time in seconds, e.g. 0.0012 or 1.2e-3.` }).refine(Number.isFinite, `${name} must be a finite number of seconds.`);

/** Query of GET /api/v1/runs/{runId}/excerpt: the time window to read, seconds on the capture's own time axis. */
export const runExcerptQuerySchema = z
  .object({
    fromS: seconds("fromS"),
    toS: seconds("toS"),
  })
  .refine((q) => q.toS > q.fromS, { message: "toS must be later than fromS.", path: ["toS"] });

export type RunExcerptQuery = z.infer<typeof runExcerptQuerySchema>;
