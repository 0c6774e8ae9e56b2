import { availableParallelism } from "node:os";
import { z } from "zod";

// Queue and worker settings, read from the environment when first asked (so tests can set them before).
const settingsSchema = z.object({
  /** Worker threads (and concurrent jobs) per worker process; default: all cores but one, at least 1. */
  ANALYSIS_THREADS: z.coerce.number().int().min(1).max(64).optional(),
  /** A job running longer than this is presumed lost (its worker died) and retried. */
  ANALYSIS_JOB_TIMEOUT_SECONDS: z.coerce.number().int().min(1).default(600),
  /** Retries after the first attempt for a transient failure (storage or database unreachable, worker lost). */
  ANALYSIS_RETRY_LIMIT: z.coerce.number().int().min(0).max(20).default(3),
  /** First retry delay; doubles on each retry. */
  ANALYSIS_RETRY_DELAY_SECONDS: z.coerce.number().int().min(1).default(5),
  /** How often a worker looks for jobs that timed out. */
  ANALYSIS_MAINTENANCE_SECONDS: z.coerce.number().int().min(1).default(30),
  /** How often an idle worker polls for new jobs. */
  ANALYSIS_POLL_SECONDS: z.coerce.number().min(0.5).default(1),
});

export interface JobSettings {
  threads: number;
  jobTimeoutSeconds: number;
  retryLimit: number;
  retryDelaySeconds: number;
  maintenanceSeconds: number;
  pollSeconds: number;
}

/** The queue settings from the environment (validated; throws one readable line per bad variable). */
export function jobSettings(): JobSettings {
  const parsed = settingsSchema.safeParse(process.env);
  if (!parsed.success) {
    throw new Error(`Bad analysis queue settings:\n${parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("\n")}`);
  }
  const e = parsed.data;
  return {
    threads: e.ANALYSIS_THREADS ?? Math.max(1, availableParallelism() - 1),
    jobTimeoutSeconds: e.ANALYSIS_JOB_TIMEOUT_SECONDS,
    retryLimit: e.ANALYSIS_RETRY_LIMIT,
    retryDelaySeconds: e.ANALYSIS_RETRY_DELAY_SECONDS,
    maintenanceSeconds: e.ANALYSIS_MAINTENANCE_SECONDS,
    pollSeconds: e.ANALYSIS_POLL_SECONDS,
  };
}
