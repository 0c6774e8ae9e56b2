import type { Knex } from "knex";
import PgBoss from "pg-boss";
import { jobSettings } from "./config";
import { ANALYSIS_QUEUED_CHANNEL } from "./wake";

/** The pg-boss queue of analysis jobs: one job per run id, data `{ runId }`. */
export const ANALYSIS_QUEUE = "analyse-run";
/** pg-boss keeps its tables in their own schema, apart from ours. */
export const QUEUE_SCHEMA = "pgboss";

export interface AnalysisJobData {
  runId: string;
}

/** The queue's database (the app's own). */
export function databaseUrl(): string {
  return process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/tankbook";
}

/**
 * A started pg-boss instance. `supervise` makes it run maintenance (expiring jobs whose worker died, so they
 * are retried); only worker processes do that, web servers only send.
 */
export async function startBoss(options: { supervise: boolean; poolMax?: number }): Promise<PgBoss> {
  const settings = jobSettings();
  const boss = new PgBoss({
    connectionString: databaseUrl(),
    schema: QUEUE_SCHEMA,
    max: options.poolMax ?? 4,
    application_name: options.supervise ? "tankbook-worker" : "tankbook-web",
    supervise: options.supervise,
    schedule: false,
    migrate: true,
    maintenanceIntervalSeconds: settings.maintenanceSeconds,
  });
  boss.on("error", (err) => console.error(`analysis queue: ${err.message}`));
  await boss.start();
  await ensureAnalysisQueue(boss);
  return boss;
}

/**
 * Creates the analysis queue when missing. The singleton policy with the run id as key lets at most one job
 * per run be active at a time, however many workers poll.
 */
export async function ensureAnalysisQueue(boss: PgBoss): Promise<void> {
  const s = jobSettings();
  await boss.createQueue(ANALYSIS_QUEUE, {
    name: ANALYSIS_QUEUE,
    policy: "singleton",
    retryLimit: s.retryLimit,
    retryDelay: s.retryDelaySeconds,
    retryBackoff: true,
    expireInSeconds: s.jobTimeoutSeconds,
  });
}

// One sender per process and database, shared by every request (Next may evaluate this module more than once).
const globalForQueue = globalThis as unknown as { tankbookQueue?: { url: string; boss: Promise<PgBoss> } };

/** The process's sending pg-boss instance (started on first use). */
export function senderBoss(): Promise<PgBoss> {
  const url = databaseUrl();
  if (globalForQueue.tankbookQueue?.url !== url) {
    const boss = startBoss({ supervise: false, poolMax: 2 });
    // A failed start must not be cached: the next request tries again.
    boss.catch(() => {
      if (globalForQueue.tankbookQueue?.boss === boss) globalForQueue.tankbookQueue = undefined;
    });
    globalForQueue.tankbookQueue = { url, boss };
  }
  return globalForQueue.tankbookQueue.boss;
}

/** Stops the sending instance (scripts and tests, before exit). */
export async function stopSender(): Promise<void> {
  const cached = globalForQueue.tankbookQueue;
  globalForQueue.tankbookQueue = undefined;
  if (cached) await (await cached.boss.catch(() => null))?.stop({ graceful: false, wait: true });
}

/**
 * pg-boss's Db interface over a Knex transaction, so a job is inserted in the same transaction as the run
 * it analyses: either both commit or neither does. pg-boss writes `$n` placeholders; Knex wants `?`.
 */
function knexExecutor(trx: Knex | Knex.Transaction): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[] = []) {
      const bindings: unknown[] = [];
      const sql = text.replace(/\$(\d+)/g, (_, n: string) => {
        bindings.push(values[Number(n) - 1] ?? null);
        return "?";
      });
      const result = await trx.raw(sql, bindings as Knex.RawBinding[]);
      return { rows: result.rows ?? [] };
    },
  };
}

/**
 * Queues the analysis of a run and wakes the idle workers (lib/jobs/wake.ts) when it commits.
 * @param trx the transaction that creates or resets the run; the job and the wake-up commit with it
 * @returns the job id, or null when a job for this run is already waiting
 */
export async function enqueueAnalysis(runId: string, trx?: Knex | Knex.Transaction): Promise<string | null> {
  const boss = await senderBoss();
  const data: AnalysisJobData = { runId };
  if (!trx) {
    const id = await boss.send(ANALYSIS_QUEUE, data, { singletonKey: runId });
    await boss.getDb().executeSql(`select pg_notify('${ANALYSIS_QUEUED_CHANNEL}', '')`, []);
    return id;
  }
  const id = await boss.send(ANALYSIS_QUEUE, data, { singletonKey: runId, db: knexExecutor(trx) });
  await trx.raw(`select pg_notify('${ANALYSIS_QUEUED_CHANNEL}', '')`);
  return id;
}

/** Whether a run has a job that is waiting, retrying or running (for the worker's safety sweep). */
export async function hasPendingJob(runId: string, trx: Knex | Knex.Transaction): Promise<boolean> {
  const result = await trx.raw(
    `select 1 from ${QUEUE_SCHEMA}.job where name = ? and singleton_key = ? and state < 'completed' limit 1`,
    [ANALYSIS_QUEUE, runId],
  );
  return result.rows.length > 0;
}
