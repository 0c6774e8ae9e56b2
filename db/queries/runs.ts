import type { Knex } from "knex";
import type { Topology, WindingSense } from "@/lib/oscillator/design";
import type { DesignSpec, SpecCheck } from "@/lib/spec/types";
import type { Parts } from "./designs";
import { flagFromJsonRow, RUN_FLAGS_JSON_SQL, type Flag } from "./flags";
import { RUN_TWEAK_JSON_SQL, tweakFromJsonRow, type Tweak } from "./tweaks";
import { db } from "../index";
import { cursorColumn, paginate, toNumber, toPage, type Page, type PageRequest } from "./pagination";

export const RUN_STATUSES = ["queued", "running", "done", "failed"] as const;
export type RunStatus = (typeof RUN_STATUSES)[number];
/** A run's spec verdict; "inconclusive" when no rule failed but one could not be judged on the capture. */
export type Verdict = "pass" | "fail" | "inconclusive";

/** What the build was when the capture was logged; the run is judged against this, never against later values. */
export interface RunSnapshot {
  topology: Topology;
  designId: string;
  designRevisionId: string;
  designRevision: number;
  parts: Parts;
  extraCapacitanceF: number | null;
  windings: WindingSense | null;
  /** Null only when the as-built values cannot be predicted (the model refused them). */
  predictedHz: number | null;
  lEffH: number | null;
  cEffF: number | null;
  worstCase: { minHz: number; maxHz: number } | null;
  statistical: { minHz: number; maxHz: number } | null;
  spec: DesignSpec;
  /**
   * The design revision the spec was taken from: the upload's revision at first, the design's current one after a
   * re-analysis (which judges the run against the spec as it is then). Absent on runs never re-analysed.
   */
  specRevision?: number;
  /** Why there is no prediction, when there is none. */
  predictionError?: string;
}

/** A run as lists show it (no snapshot, results or plot). */
export interface RunSummary {
  id: string;
  buildId: string;
  tweakId: string | null;
  originalFilename: string;
  sizeBytes: number;
  channel: string | null;
  status: RunStatus;
  predictedHz: number | null;
  measuredHz: number | null;
  frequencyUncertaintyHz: number | null;
  driftPpm: number | null;
  impliedExtraCapacitanceF: number | null;
  fundamentalVpk: number | null;
  thdPercent: number | null;
  worstHarmonicDbc: number | null;
  verdict: Verdict | null;
  error: string | null;
  duplicateOfRunId: string | null;
  createdBy: string;
  createdByName: string;
  createdAt: Date;
  finishedAt: Date | null;
  /** When the run was withdrawn from the figures (never deleted); null while it counts. */
  withdrawnAt: Date | null;
  withdrawnBy: string | null;
  withdrawalReason: string | null;
}

export interface Run extends RunSummary {
  designRevisionId: string;
  objectKey: string;
  sha256: string;
  probeAttenuation: number;
  supplyV: number | null;
  temperatureC: number | null;
  note: string;
  snapshot: RunSnapshot;
  engineVersion: string | null;
  /** The engine's result object (the same fields `analyze --json` prints); null until done. */
  results: Record<string, unknown> | null;
  /** Every spec check of the latest analysis, passed ones included; null until done. */
  specChecks: SpecCheck[] | null;
  /** Frequency change between the first and last thirds of the record, ppm; null when not measured. */
  inRecordDriftPpm: number | null;
  attempts: number;
  updatedAt: Date;
  startedAt: Date | null;
}

interface RunRow {
  id: string;
  build_id: string;
  design_revision_id: string;
  tweak_id: string | null;
  object_key: string;
  sha256: string;
  size_bytes: string;
  original_filename: string;
  channel: string | null;
  probe_attenuation: number;
  supply_v: number | null;
  temperature_c: number | null;
  note: string;
  snapshot: RunSnapshot;
  predicted_hz: number | null;
  status: RunStatus;
  error: string | null;
  engine_version: string | null;
  results: Record<string, unknown> | null;
  spec_checks: SpecCheck[] | null;
  in_record_drift_ppm: number | null;
  measured_hz: number | null;
  frequency_uncertainty_hz: number | null;
  drift_ppm: number | null;
  implied_extra_capacitance_f: number | null;
  fundamental_vpk: number | null;
  thd_percent: number | null;
  worst_harmonic_dbc: number | null;
  verdict: Verdict | null;
  attempts: number;
  duplicate_of_run_id: string | null;
  created_by: string;
  created_by_name: string;
  created_at: Date;
  updated_at: Date;
  started_at: Date | null;
  finished_at: Date | null;
  withdrawn_at: Date | null;
  withdrawn_by: string | null;
  withdrawal_reason: string | null;
}

const summaryColumns = [
  "r.id",
  "r.build_id",
  "r.tweak_id",
  "r.original_filename",
  "r.size_bytes",
  "r.channel",
  "r.status",
  "r.predicted_hz",
  "r.measured_hz",
  "r.frequency_uncertainty_hz",
  "r.drift_ppm",
  "r.implied_extra_capacitance_f",
  "r.fundamental_vpk",
  "r.thd_percent",
  "r.worst_harmonic_dbc",
  "r.verdict",
  "r.error",
  "r.duplicate_of_run_id",
  "r.created_by",
  "r.created_at",
  "r.finished_at",
  "r.withdrawn_at",
  "r.withdrawn_by",
  "r.withdrawal_reason",
];

function toSummary(row: RunRow): RunSummary {
  return {
    id: row.id,
    buildId: row.build_id,
    tweakId: row.tweak_id,
    originalFilename: row.original_filename,
    sizeBytes: toNumber(row.size_bytes) ?? 0,
    channel: row.channel,
    status: row.status,
    predictedHz: row.predicted_hz,
    measuredHz: row.measured_hz,
    frequencyUncertaintyHz: row.frequency_uncertainty_hz,
    driftPpm: row.drift_ppm,
    impliedExtraCapacitanceF: row.implied_extra_capacitance_f,
    fundamentalVpk: row.fundamental_vpk,
    thdPercent: row.thd_percent,
    worstHarmonicDbc: row.worst_harmonic_dbc,
    verdict: row.verdict,
    error: row.error,
    duplicateOfRunId: row.duplicate_of_run_id,
    createdBy: row.created_by,
    createdByName: row.created_by_name,
    createdAt: row.created_at,
    finishedAt: row.finished_at,
    withdrawnAt: row.withdrawn_at,
    withdrawnBy: row.withdrawn_by,
    withdrawalReason: row.withdrawal_reason,
  };
}

function toRun(row: RunRow): Run {
  return {
    ...toSummary(row),
    designRevisionId: row.design_revision_id,
    objectKey: row.object_key,
    sha256: row.sha256,
    probeAttenuation: row.probe_attenuation,
    supplyV: row.supply_v,
    temperatureC: row.temperature_c,
    note: row.note,
    snapshot: row.snapshot,
    engineVersion: row.engine_version,
    results: row.results,
    specChecks: row.spec_checks,
    inRecordDriftPpm: row.in_record_drift_ppm,
    attempts: row.attempts,
    updatedAt: row.updated_at,
    startedAt: row.started_at,
  };
}

const detailColumns = [
  "r.design_revision_id",
  "r.object_key",
  "r.sha256",
  "r.probe_attenuation",
  "r.supply_v",
  "r.temperature_c",
  "r.note",
  "r.snapshot",
  "r.engine_version",
  "r.results",
  "r.spec_checks",
  "r.in_record_drift_ppm",
  "r.attempts",
  "r.updated_at",
  "r.started_at",
];

function fullQuery(trx: Knex | Knex.Transaction) {
  // The plot is left out here: it is the largest column and only its own route needs it.
  return trx("runs as r")
    .join("auth_user as u", "u.id", "r.created_by")
    .select(...summaryColumns, ...detailColumns, "u.name as created_by_name");
}

export async function getRun(id: string, trx: Knex | Knex.Transaction = db()): Promise<Run | null> {
  const row = await fullQuery(trx).where("r.id", id).first<RunRow | undefined>();
  return row ? toRun(row) : null;
}

/** The names of the build a run belongs to, as its detail shows them. */
export interface RunBuildNames {
  id: string;
  label: string;
  designId: string;
  designName: string;
  projectId: string;
  projectName: string;
}

/**
 * A run with what its detail shows beside it: its build's names, its flags (in flag order) and its tweak, in one
 * query instead of four (the run's detail is the API's most requested read).
 * @returns null for an unknown run
 */
export async function getRunWithContext(
  id: string,
  trx: Knex | Knex.Transaction = db(),
): Promise<{ run: Run; build: RunBuildNames; flags: Flag[]; tweak: Tweak | null } | null> {
  const row = await fullQuery(trx)
    .join("builds as b", "b.id", "r.build_id")
    .join("designs as d", "d.id", "b.design_id")
    .join("projects as p", "p.id", "d.project_id")
    .select(
      "b.label as build_label",
      "b.design_id as build_design_id",
      "d.name as build_design_name",
      "d.project_id as build_project_id",
      "p.name as build_project_name",
      trx.raw(`${RUN_FLAGS_JSON_SQL} as flag_rows`),
      trx.raw(`${RUN_TWEAK_JSON_SQL} as tweak_row`),
    )
    .where("r.id", id)
    .first<(RunRow & Record<string, any>) | undefined>();
  if (!row) return null;
  return {
    run: toRun(row),
    build: {
      id: row.build_id,
      label: row.build_label,
      designId: row.build_design_id,
      designName: row.build_design_name,
      projectId: row.build_project_id,
      projectName: row.build_project_name,
    },
    flags: row.flag_rows.map(flagFromJsonRow),
    tweak: row.tweak_row ? tweakFromJsonRow(row.tweak_row) : null,
  };
}

/** The plot data the worker stored for the run page (waveform envelope, spectrum, markers); null until done. */
export async function getRunPlot(id: string, trx: Knex | Knex.Transaction = db()): Promise<unknown | null> {
  const row = await trx("runs").where({ id }).first<{ plot: unknown } | undefined>("plot");
  return row?.plot ?? null;
}

/** The run already logged on this build from a file with the same SHA-256 (a kept second copy does not count). */
export async function findDuplicateRun(buildId: string, sha256: string, trx: Knex | Knex.Transaction = db()): Promise<Run | null> {
  const row = await fullQuery(trx).where({ "r.build_id": buildId, "r.sha256": sha256 }).whereNull("r.duplicate_of_run_id").first<RunRow | undefined>();
  return row ? toRun(row) : null;
}

export interface RunFilter extends PageRequest {
  verdict?: Verdict | "none";
  status?: RunStatus;
  /** Created at or after. */
  from?: Date;
  /** Created before. */
  to?: Date;
}

/**
 * Applies the runs table's verdict, status and time filters to a query on `runs as r`; shared with the CSV
 * export so the file holds the rows the table shows.
 */
export function whereRunFilter<Q extends Knex.QueryBuilder>(query: Q, filter: Omit<RunFilter, "cursor" | "limit">): Q {
  if (filter.verdict === "none") query.whereNull("r.verdict");
  else if (filter.verdict) query.where("r.verdict", filter.verdict);
  if (filter.status) query.where("r.status", filter.status);
  if (filter.from) query.where("r.created_at", ">=", filter.from);
  if (filter.to) query.where("r.created_at", "<", filter.to);
  return query;
}

/** A build's runs, newest first. */
function buildRunsQuery(trx: Knex | Knex.Transaction, buildId: string, filter: RunFilter, extraColumns: string[]) {
  const query = trx("runs as r")
    .join("auth_user as u", "u.id", "r.created_by")
    .select(...summaryColumns, ...extraColumns, "u.name as created_by_name", cursorColumn(trx as Knex, "r"))
    .where("r.build_id", buildId);
  return paginate(whereRunFilter(query, filter), "r", filter);
}

export async function listRuns(buildId: string, filter: RunFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<Page<RunSummary>> {
  const rows = await buildRunsQuery(trx, buildId, filter, []);
  return toPage(rows as (RunRow & { cursor_ts: string })[], filter, toSummary);
}

/** {@link listRuns} with each run's snapshot (the prediction, bands and spec it was judged against), in one query. */
export async function listRunsWithSnapshot(
  buildId: string,
  filter: RunFilter = {},
  trx: Knex | Knex.Transaction = db(),
): Promise<Page<RunSummary & { snapshot: RunSnapshot }>> {
  const rows = await buildRunsQuery(trx, buildId, filter, ["r.snapshot"]);
  return toPage(rows as (RunRow & { cursor_ts: string })[], filter, (row) => ({ ...toSummary(row), snapshot: row.snapshot }));
}

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

export interface RunResultColumns {
  engineVersion: string;
  results: Record<string, unknown>;
  plot: unknown;
  measuredHz: number;
  frequencyUncertaintyHz: number | null;
  driftPpm: number | null;
  impliedExtraCapacitanceF: number | null;
  fundamentalVpk: number | null;
  thdPercent: number | null;
  worstHarmonicDbc: number | null;
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
