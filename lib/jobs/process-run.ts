import { db } from "@/db/index";
import { getBuild } from "@/db/queries/builds";
import { replaceRunFlags } from "@/db/queries/flags";
import { claimRun, completeRun, failRun, getRun, type Run } from "@/db/queries/runs";
import type { AnalysisResult } from "@/lib/analysis";
import { impliedExtraCapacitanceF } from "@/lib/oscillator";
import { buildSensitivityForSpec } from "@/lib/logbook/sensitivity";
import { evaluateSpec } from "@/lib/spec/evaluate";
import { needsBuildSensitivity } from "@/lib/spec/stability-rules";
import type { AnalysisTaskInput, AnalysisTaskOutput } from "./analysis-task";
import { retryWhileDatabaseDown } from "./database-retry";

/** What one job did with its run. */
export type JobOutcome = "done" | "failed" | "skipped" | "superseded";

export interface ProcessRunOptions {
  /** Runs the analysis (normally on the worker-thread pool). */
  analyse: (input: AnalysisTaskInput) => Promise<AnalysisTaskOutput>;
  /** True on the queue's last attempt: a transient failure then ends the run as failed instead of retrying. */
  lastAttempt: boolean;
  /** Told when the final write waits for the database to come back. */
  log?: (line: string) => void;
}

/** Frequency and stray figures of a finished analysis against the run's snapshot. */
export function derivedColumns(run: Pick<Run, "snapshot">, result: Pick<AnalysisResult, "frequencyHz">) {
  const { predictedHz, lEffH, cEffF } = run.snapshot;
  const driftPpm = predictedHz ? ((result.frequencyHz - predictedHz) / predictedHz) * 1e6 : null;
  const stray = lEffH && cEffF && result.frequencyHz > 0 ? impliedExtraCapacitanceF(lEffH, cEffF, result.frequencyHz) : null;
  return { driftPpm, impliedExtraCapacitanceF: stray };
}

function worstHarmonicDbc(result: AnalysisResult): number | null {
  const levels = result.harmonics.map((h) => h.dBc).filter((v): v is number => v !== null && Number.isFinite(v));
  return levels.length ? Math.max(...levels) : null;
}

// A test-only stretch of every job, so a test can kill a worker while it holds a job. Ignored outside tests.
function testDelayMs(): number {
  if (process.env.NODE_ENV !== "test") return 0;
  const ms = Number(process.env.TANKBOOK_TEST_ANALYSIS_DELAY_MS ?? 0);
  return Number.isFinite(ms) && ms > 0 ? ms : 0;
}

// The analysis is done when its result is written: a short database outage is waited out here (about 30 s)
// instead of leaving the run "running" until the queue's job timeout hands it to another attempt.
function storeFinal<T>(runId: string, options: ProcessRunOptions, write: () => Promise<T>): Promise<T> {
  return retryWhileDatabaseDown(write, {
    onRetry: (err, delayMs) =>
      options.log?.(`run ${runId}: the database is not answering (${err instanceof Error ? err.message : String(err)}); retrying the result write in ${delayMs} ms`),
  });
}

/**
 * Analyses one run: claims it (a new attempt number), runs the engine, stores results, plot and the query
 * columns, evaluates the spec of the run's snapshot and replaces its flags — or marks it failed with the
 * importer's message. The raw capture is never touched. A final write that meets a lost database is retried with
 * backoff for about 30 s before the error goes to the queue.
 *
 * @returns what happened; throws only for a transient failure that the queue should retry
 */
export async function processRun(runId: string, options: ProcessRunOptions): Promise<JobOutcome> {
  const run = await getRun(runId);
  // Finished runs are only analysed again through a re-analysis, which sets them back to queued first.
  if (!run || run.status === "done" || run.status === "failed") return "skipped";
  const attempt = await claimRun(runId);
  if (attempt === null) return "skipped";
  // The bench's scope timebase accuracy, read now while the database answers (after the analysis only the result
  // write may wait for it): it limits what a frequency rule can decide.
  const timebasePpm = (await getBuild(run.buildId))?.timebasePpm ?? null;

  let output: AnalysisTaskOutput;
  try {
    output = await options.analyse({
      objectKey: run.objectKey,
      sizeBytes: run.sizeBytes,
      channel: run.channel,
      probeAttenuation: run.probeAttenuation,
    });
    const delay = testDelayMs();
    if (delay) await new Promise((resolve) => setTimeout(resolve, delay));
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    if (!options.lastAttempt) throw err;
    await storeFinal(runId, options, () =>
      failRun(runId, attempt, `The analysis could not finish after several attempts: ${message}. The capture is kept; re-analyse to try again.`, null),
    );
    return "failed";
  }

  if (!output.ok) {
    const stored = await storeFinal(runId, options, () => db().transaction(async (trx) => {
      const ok = await failRun(runId, attempt, output.message, output.engineVersion, trx);
      if (ok) await replaceRunFlags(runId, run.buildId, [], trx);
      return ok;
    }));
    return stored ? "failed" : "superseded";
  }

  const { result, plot } = output;
  const thdPercent = result.thdPercent !== null && Number.isFinite(result.thdPercent) ? result.thdPercent : null;
  const inRecordDriftPpm = result.inRecordDrift?.ppm ?? null;
  const spec = run.snapshot.spec ?? {};
  // Pushing and tempco rules judge the build across its runs, this one included (read before the final write).
  const buildSensitivity = needsBuildSensitivity(spec)
    ? await buildSensitivityForSpec(run.buildId, timebasePpm, {
        id: run.id,
        createdAt: run.createdAt,
        originalFilename: run.originalFilename,
        measuredHz: result.frequencyHz,
        frequencyUncertaintyHz: result.frequencyUncertaintyHz,
        fundamentalVpk: result.fundamentalVpk,
        supplyV: run.supplyV,
        temperatureC: run.temperatureC,
        warningCodes: result.warnings.map((w) => w.code),
        design: { topology: run.snapshot.topology, parts: run.snapshot.parts, ...(run.snapshot.extraCapacitanceF ? { extraCapacitanceF: run.snapshot.extraCapacitanceF } : {}), ...(run.snapshot.windings ? { windings: run.snapshot.windings } : {}) },
      })
    : null;
  const evaluation = evaluateSpec(spec, {
    timebasePpm,
    frequencyHz: result.frequencyHz,
    thdPercent,
    thd: result.thd,
    harmonics: result.harmonics,
    fundamentalVpk: result.fundamentalVpk,
    inRecordDriftPpm,
    warnings: result.warnings,
    stability: result.stability ?? null,
    buildSensitivity,
  });
  const derived = derivedColumns(run, result);
  const stored = await storeFinal(runId, options, () => db().transaction(async (trx) => {
    const ok = await completeRun(
      runId,
      attempt,
      {
        engineVersion: output.engineVersion,
        results: result as unknown as Record<string, unknown>,
        plot,
        measuredHz: result.frequencyHz,
        frequencyUncertaintyHz: result.frequencyUncertaintyHz,
        driftPpm: derived.driftPpm,
        impliedExtraCapacitanceF: derived.impliedExtraCapacitanceF,
        fundamentalVpk: result.fundamentalVpk,
        thdPercent,
        worstHarmonicDbc: worstHarmonicDbc(result),
        inRecordDriftPpm,
        specChecks: evaluation.checks,
        verdict: evaluation.verdict,
      },
      trx,
    );
    if (ok) {
      await replaceRunFlags(
        runId,
        run.buildId,
        // Flags are broken rules; a rule the capture could not judge shows on the run as "cannot judge" instead.
        evaluation.checks.filter((c) => c.outcome === "fail").map(({ rule, measured, limit, margin, unit, message }) => ({ rule, measured, limit, margin, unit, message })),
        trx,
      );
    }
    return ok;
  }));
  return stored ? "done" : "superseded";
}
