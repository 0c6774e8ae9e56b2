// A run's row as the queries read it, and the mapping to the domain types every runs-* query returns.
import type { Knex } from "knex";
import type { Topology, WindingSense } from "@/lib/oscillator/design";
import type { DesignSpec, SpecCheck } from "@/lib/spec/types";
import type { Parts } from "./designs";
import { toNumber } from "./pagination";

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

/** The figures a finished analysis writes in columns of their own beside its result (null before it, or when not measured). */
export interface RunFigureColumns {
  frequencyUncertaintyHz: number | null;
  driftPpm: number | null;
  impliedExtraCapacitanceF: number | null;
  fundamentalVpk: number | null;
  thdPercent: number | null;
  worstHarmonicDbc: number | null;
}

/** A run as lists show it (no snapshot, results or plot). */
export interface RunSummary extends RunFigureColumns {
  id: string;
  buildId: string;
  tweakId: string | null;
  originalFilename: string;
  sizeBytes: number;
  channel: string | null;
  status: RunStatus;
  predictedHz: number | null;
  measuredHz: number | null;
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

export interface RunRow {
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

/** The measured figures a finished analysis writes in columns of their own (see {@link RunFigureColumns}), with the measured frequency. */
export const figureColumns = [
  "r.measured_hz",
  "r.frequency_uncertainty_hz",
  "r.drift_ppm",
  "r.implied_extra_capacitance_f",
  "r.fundamental_vpk",
  "r.thd_percent",
  "r.worst_harmonic_dbc",
];

export const summaryColumns = [
  "r.id",
  "r.build_id",
  "r.tweak_id",
  "r.original_filename",
  "r.size_bytes",
  "r.channel",
  "r.status",
  "r.predicted_hz",
  ...figureColumns,
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

export function toSummary(row: RunRow): RunSummary {
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

export function toRun(row: RunRow): Run {
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

export const detailColumns = [
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

export function fullQuery(trx: Knex | Knex.Transaction) {
  // The plot is left out here: it is the largest column and only its own route needs it.
  return trx("runs as r")
    .join("auth_user as u", "u.id", "r.created_by")
    .select(...summaryColumns, ...detailColumns, "u.name as created_by_name");
}
