import type PgBoss from "pg-boss";
import { db } from "@/db/index";
import { notifyFlags } from "@/lib/alerts";
import { failAbandonedRun, listStaleUnfinishedRuns } from "@/db/queries/runs";
import { deleteUploadSlot, listExpiredUploadSlots } from "@/db/queries/uploads";
import { deleteObject } from "@/lib/storage";
import { jobSettings } from "./config";
import { createAnalysisPool, type AnalysisPool } from "./pool";
import { processRun } from "./process-run";
import { ANALYSIS_QUEUE, databaseUrl, enqueueAnalysis, hasPendingJob, startBoss, type AnalysisJobData } from "./queue";
import { listenForQueuedJobs } from "./wake";

export interface AnalysisWorker {
  /** Stops taking jobs, lets running ones finish (up to `timeoutMs`), then closes the pool and connections. */
  stop(timeoutMs?: number): Promise<void>;
}

export interface WorkerOptions {
  /** Concurrent jobs and analysis threads; default from ANALYSIS_THREADS. */
  threads?: number;
  /** Print one line per job (the standalone worker does). */
  log?: (line: string) => void;
}

const SWEEP_EVERY_MS = 60_000;

/**
 * Looks for runs that were left behind: queued with no job (a job lost outside our transaction), or running
 * with no job left (every attempt's worker died and the queue gave up). The first are queued again, the
 * second marked failed so they can be re-analysed. Jobs still waiting or retrying are left alone.
 */
export async function sweepUnfinishedRuns(olderThanMs: number): Promise<{ requeued: number; failed: number }> {
  const stale = await listStaleUnfinishedRuns(new Date(Date.now() - olderThanMs));
  let requeued = 0;
  let failed = 0;
  for (const run of stale) {
    if (await hasPendingJob(run.id, db())) continue;
    if (run.status === "queued") {
      await enqueueAnalysis(run.id);
      requeued++;
    } else {
      const ended = await failAbandonedRun(
        run.id,
        "The analysis stopped without a result (its worker was lost on every attempt). The capture is kept; re-analyse to try again.",
      );
      if (ended) failed++;
    }
  }
  return { requeued, failed };
}

/**
 * Removes upload slots that expired without being completed, with whatever bytes reached storage for them
 * (a browser that gave up half-way, a tab closed after the PUT).
 * @param graceMs how long after expiry a slot is kept (a slow registration may still be on its way)
 */
export async function sweepExpiredUploads(graceMs = 3600_000): Promise<number> {
  const expired = await listExpiredUploadSlots(new Date(Date.now() - graceMs));
  for (const slot of expired) {
    await deleteObject(slot.objectKey);
    await deleteUploadSlot(slot.id);
  }
  return expired.length;
}

/**
 * Starts an analysis worker in this process: pg-boss fetches jobs (one per run id at a time, across every
 * worker on every machine), each job's analysis runs on a piscina thread, results go to PostgreSQL. Idle workers
 * fetch as soon as a job is announced (lib/jobs/wake.ts) and poll every ANALYSIS_POLL_SECONDS besides.
 * Maintenance in pg-boss re-queues jobs whose worker died (after ANALYSIS_JOB_TIMEOUT_SECONDS).
 */
export async function startAnalysisWorker(options: WorkerOptions = {}): Promise<AnalysisWorker> {
  const settings = jobSettings();
  const threads = options.threads ?? settings.threads;
  const log = options.log ?? (() => undefined);
  const boss: PgBoss = await startBoss({ supervise: true, poolMax: threads + 2 });
  const pool: AnalysisPool = createAnalysisPool(threads);

  const workerIds: string[] = [];
  for (let i = 0; i < threads; i++) {
    let workerId = "";
    workerId = await boss.work<AnalysisJobData>(
      ANALYSIS_QUEUE,
      { batchSize: 1, includeMetadata: true, pollingIntervalSeconds: settings.pollSeconds },
      async ([job]) => {
        const started = Date.now();
        try {
          const outcome = await processRun(job.data.runId, {
            analyse: (input) => pool.run(input),
            lastAttempt: job.retryCount >= job.retryLimit,
            log,
          });
          if (outcome === "done") await notifyFlags(job.data.runId); // never throws: a mail failure is logged, the run stays done
          log(`run ${job.data.runId}: ${outcome} in ${Date.now() - started} ms (attempt ${job.retryCount + 1})`);
          return { outcome };
        } finally {
          // pg-boss waits out the rest of its polling interval after a job shorter than it; with more jobs
          // waiting that idled the thread for up to a second per job. Marked as notified, it fetches at once.
          boss.notifyWorker(workerId);
        }
      },
    );
    workerIds.push(workerId);
  }
  const listener = await listenForQueuedJobs(databaseUrl(), () => {
    for (const id of workerIds) boss.notifyWorker(id);
  }, log);

  const sweepAfterMs = (settings.jobTimeoutSeconds + 60) * 1000;
  const sweep = setInterval(() => {
    sweepUnfinishedRuns(sweepAfterMs)
      .then(async (r) => {
        if (r.requeued || r.failed) log(`sweep: ${r.requeued} queued again, ${r.failed} marked failed`);
        const removed = await sweepExpiredUploads();
        if (removed) log(`sweep: ${removed} expired uploads removed`);
      })
      .catch((err) => log(`sweep failed: ${err instanceof Error ? err.message : String(err)}`));
  }, SWEEP_EVERY_MS);
  sweep.unref();

  let stopped = false;
  return {
    async stop(timeoutMs = 30_000) {
      if (stopped) return;
      stopped = true;
      clearInterval(sweep);
      await listener.stop();
      await boss.stop({ graceful: true, wait: true, timeout: timeoutMs });
      await pool.destroy();
    },
  };
}
