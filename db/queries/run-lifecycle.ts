// A run's life in the analysis pipeline: created at upload, claimed by an attempt, completed or failed, reset
// for a re-analysis, swept when abandoned.
import type { Knex } from "knex";
import type { DesignSpec, SpecCheck } from "@/lib/spec/types";
import { db } from "../index";
import { getRun } from "./run-detail";
import type { Run, RunFigureColumns, RunSnapshot, RunStatus, Verdict } from "./run-rows";

export interface CreateRunInput {
  id: string;
  buildId: string;
  designRevisionId: string;
  tweakId: string | null;
  objectKey: string;
  sha256: string;
  sizeBytes: number;
  originalFilename: string;
  channel: string | null;
  probeAttenuation: number;
  supplyV: number | null;
  temperatureC: number | null;
  note: string;
  snapshot: RunSnapshot;
  duplicateOfRunId: string | null;
  createdBy: string;
  /** For the demo seed's back-dated history; the database clock otherwise. */
  createdAt?: Date;
}

export async function createRun(input: CreateRunInput, trx: Knex | Knex.Transaction = db()): Promise<Run> {
  await trx("runs").insert({
    id: input.id,
    build_id: input.buildId,
    design_revision_id: input.designRevisionId,
    tweak_id: input.tweakId,
    object_key: input.objectKey,
    sha256: input.sha256,
    size_bytes: input.sizeBytes,
    original_filename: input.originalFilename,
    channel: input.channel,
    probe_attenuation: input.probeAttenuation,
    supply_v: input.supplyV,
    temperature_c: input.temperatureC,
    note: input.note,
    snapshot: JSON.stringify(input.snapshot),
    predicted_hz: input.snapshot.predictedHz,
    duplicate_of_run_id: input.duplicateOfRunId,
    created_by: input.createdBy,
    ...(input.createdAt ? { created_at: input.createdAt, updated_at: input.createdAt } : {}),
  });
  return (await getRun(input.id, trx))!;
}

/**
 * Marks a run as being analysed by one attempt.
 * @returns the attempt number this worker now owns (later writes must quote it), or null when the run is gone
 */
export async function claimRun(id: string, trx: Knex | Knex.Transaction = db()): Promise<number | null> {
  const rows: { attempts: number }[] = await trx("runs")
    .where({ id })
    .update({ status: "running", attempts: trx.raw("attempts + 1"), started_at: trx.fn.now(), updated_at: trx.fn.now(), error: null })
    .returning("attempts");
  return rows[0]?.attempts ?? null;
}

export interface RunResultColumns extends RunFigureColumns {
  engineVersion: string;
  results: Record<string, unknown>;
  plot: unknown;
  measuredHz: number;
  inRecordDriftPpm: number | null;
  specChecks: SpecCheck[];
  verdict: Verdict | null;
}

/**
 * Stores an analysis outcome, but only for the attempt that still owns the run: a worker that was presumed dead
 * and finishes late must not overwrite the retry's result.
 * @returns whether the write happened
 */
export async function completeRun(id: string, attempt: number, r: RunResultColumns, trx: Knex | Knex.Transaction = db()): Promise<boolean> {
  const count = await trx("runs")
    .where({ id, attempts: attempt, status: "running" })
    .update({
      status: "done",
      error: null,
      engine_version: r.engineVersion,
      results: JSON.stringify(r.results),
      plot: JSON.stringify(r.plot),
      measured_hz: r.measuredHz,
      frequency_uncertainty_hz: r.frequencyUncertaintyHz,
      drift_ppm: r.driftPpm,
      implied_extra_capacitance_f: r.impliedExtraCapacitanceF,
      fundamental_vpk: r.fundamentalVpk,
      thd_percent: r.thdPercent,
      worst_harmonic_dbc: r.worstHarmonicDbc,
      in_record_drift_ppm: r.inRecordDriftPpm,
      spec_checks: JSON.stringify(r.specChecks),
      verdict: r.verdict,
      finished_at: trx.fn.now(),
      updated_at: trx.fn.now(),
    });
  return count > 0;
}

/** Ends an attempt as failed with a message; same ownership rule as {@link completeRun}. */
export async function failRun(
  id: string,
  attempt: number,
  error: string,
  engineVersion: string | null,
  trx: Knex | Knex.Transaction = db(),
): Promise<boolean> {
  const count = await trx("runs")
    .where({ id, attempts: attempt, status: "running" })
    .update({ status: "failed", error, engine_version: engineVersion, finished_at: trx.fn.now(), updated_at: trx.fn.now() });
  return count > 0;
}

/** Puts a finished run back in the queue state, clearing its results, flags stay until the new analysis replaces them. */
export async function resetRunForAnalysis(
  id: string,
  trx: Knex | Knex.Transaction = db(),
  judgeAgainst?: { spec: DesignSpec; revision: number },
): Promise<boolean> {
  const count = await trx("runs")
    .where({ id })
    .whereIn("status", ["done", "failed"])
    .update({
      ...(judgeAgainst
        ? {
            // The as-built parts and their prediction stay as logged; only the spec the run is judged by moves on.
            snapshot: trx.raw("snapshot || ?::jsonb", [JSON.stringify({ spec: judgeAgainst.spec, specRevision: judgeAgainst.revision })]),
          }
        : {}),
      status: "queued",
      error: null,
      results: null,
      plot: null,
      measured_hz: null,
      frequency_uncertainty_hz: null,
      drift_ppm: null,
      implied_extra_capacitance_f: null,
      fundamental_vpk: null,
      thd_percent: null,
      worst_harmonic_dbc: null,
      in_record_drift_ppm: null,
      spec_checks: null,
      verdict: null,
      started_at: null,
      finished_at: null,
      updated_at: trx.fn.now(),
    });
  return count > 0;
}

/** Ends a run whose every attempt was lost (no attempt owns it any more). */
export async function failAbandonedRun(id: string, error: string, trx: Knex | Knex.Transaction = db()): Promise<boolean> {
  const count = await trx("runs")
    .where({ id, status: "running" })
    .update({ status: "failed", error, finished_at: trx.fn.now(), updated_at: trx.fn.now() });
  return count > 0;
}

/** Runs still waiting or running whose last change is older than `olderThan` (for the worker's safety sweep). */
export async function listStaleUnfinishedRuns(olderThan: Date, limit = 100, trx: Knex | Knex.Transaction = db()): Promise<{ id: string; status: RunStatus }[]> {
  return trx("runs").select("id", "status").whereIn("status", ["queued", "running"]).where("updated_at", "<", olderThan).orderBy("updated_at").limit(limit);
}
