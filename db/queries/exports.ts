import type { Knex } from "knex";
import { whereRunFilter, type RunFilter, type RunStatus, type Verdict } from "./runs";
import { cursorColumn } from "./pagination";
import { figureColumns, type RunFigureColumns } from "./run-rows";
import { db } from "../index";

/** One run as the export writes it: the runs table's columns plus its tweak, flags and metadata. */
export interface RunExportRow extends RunFigureColumns {
  id: string;
  createdAt: Date;
  originalFilename: string;
  status: RunStatus;
  channel: string | null;
  probeAttenuation: number;
  supplyV: number | null;
  temperatureC: number | null;
  note: string;
  /** The tweak this run follows: the part changed (null for a note-only tweak or none). */
  tweakPart: string | null;
  tweakFromSi: number | null;
  tweakToSi: number | null;
  tweakNote: string | null;
  predictedHz: number | null;
  measuredHz: number | null;
  inRecordDriftPpm: number | null;
  verdict: Verdict | null;
  /** Rules the run's analysis flagged, sorted. */
  failedRules: string[];
  engineVersion: string | null;
  createdByName: string;
  error: string | null;
  /**
   * The stored result's stability figures without their plotted curves (engine ≥ 1.3): jitter, phase-noise
   * points, period jitter, the first Allan point and the envelope; null on older results. Read by lib/exports.
   */
  stability: Record<string, unknown> | null;
  /** Set when the run was withdrawn: it stays in the export, marked, so the file accounts for every capture. */
  withdrawnAt: Date | null;
  withdrawalReason: string | null;
}

/** The runs table's filters without paging: the export holds every matching row. */
export type RunExportFilter = Omit<RunFilter, "cursor" | "limit">;

interface ExportDbRow {
  id: string;
  cursor_ts: string;
  created_at: Date;
  original_filename: string;
  status: RunStatus;
  channel: string | null;
  probe_attenuation: number;
  supply_v: number | null;
  temperature_c: number | null;
  note: string;
  tweak_part: string | null;
  tweak_from: number | null;
  tweak_to: number | null;
  tweak_note: string | null;
  predicted_hz: number | null;
  measured_hz: number | null;
  frequency_uncertainty_hz: number | null;
  drift_ppm: number | null;
  implied_extra_capacitance_f: number | null;
  fundamental_vpk: number | null;
  thd_percent: number | null;
  worst_harmonic_dbc: number | null;
  in_record_drift_ppm: number | null;
  verdict: Verdict | null;
  failed_rules: string[];
  engine_version: string | null;
  created_by_name: string;
  error: string | null;
  stability: Record<string, unknown> | null;
  withdrawn_at: Date | null;
  withdrawal_reason: string | null;
}

function toExportRow(r: ExportDbRow): RunExportRow {
  return {
    id: r.id,
    createdAt: r.created_at,
    originalFilename: r.original_filename,
    status: r.status,
    channel: r.channel,
    probeAttenuation: r.probe_attenuation,
    supplyV: r.supply_v,
    temperatureC: r.temperature_c,
    note: r.note,
    tweakPart: r.tweak_part,
    tweakFromSi: r.tweak_from,
    tweakToSi: r.tweak_to,
    tweakNote: r.tweak_note,
    predictedHz: r.predicted_hz,
    measuredHz: r.measured_hz,
    frequencyUncertaintyHz: r.frequency_uncertainty_hz,
    driftPpm: r.drift_ppm,
    impliedExtraCapacitanceF: r.implied_extra_capacitance_f,
    fundamentalVpk: r.fundamental_vpk,
    thdPercent: r.thd_percent,
    worstHarmonicDbc: r.worst_harmonic_dbc,
    inRecordDriftPpm: r.in_record_drift_ppm,
    verdict: r.verdict,
    failedRules: r.failed_rules,
    engineVersion: r.engine_version,
    createdByName: r.created_by_name,
    error: r.error,
    stability: r.stability,
    withdrawnAt: r.withdrawn_at,
    withdrawalReason: r.withdrawal_reason,
  };
}

function exportQuery(buildId: string, filter: RunExportFilter, trx: Knex | Knex.Transaction) {
  const q = trx("runs as r")
    .join("auth_user as u", "u.id", "r.created_by")
    .leftJoin("tweaks as tw", "tw.id", "r.tweak_id")
    .select(
      "r.id",
      cursorColumn(trx as Knex, "r"),
      "r.created_at",
      "r.original_filename",
      "r.status",
      "r.channel",
      "r.probe_attenuation",
      "r.supply_v",
      "r.temperature_c",
      "r.note",
      "tw.part_ref as tweak_part",
      "tw.from_value as tweak_from",
      "tw.to_value as tweak_to",
      "tw.note as tweak_note",
      "r.predicted_hz",
      ...figureColumns,
      "r.in_record_drift_ppm",
      "r.verdict",
      trx.raw("array(select f.rule from flags f where f.run_id = r.id order by f.rule) as failed_rules"),
      "r.engine_version",
      "u.name as created_by_name",
      "r.error",
      "r.withdrawn_at",
      "r.withdrawal_reason",
      // Only the figures the CSV carries: the curves would add kilobytes a row.
      trx.raw(
        "case when r.results->'stability' is not null then jsonb_build_object('jitter', r.results#>'{stability,jitter}', 'points', r.results#>'{stability,phaseNoise,points}', 'periodJitter', r.results#>'{stability,periodJitter}', 'allan', r.results#>'{stability,allan,points,0}', 'envelope', (r.results#>'{stability,envelope}') - 'curve') end as stability",
      ),
    )
    .where("r.build_id", buildId);
  return whereRunFilter(q, filter).orderBy("r.created_at", "desc").orderBy("r.id", "desc");
}

/**
 * Every run of a build that matches the runs table's filters, newest first, in batches (keyset on upload time and
 * id, so thousands of runs never sit in memory at once and a run logged mid-export does not shift the batches).
 *
 * @param batchSize - rows per batch, 1..5000 (default 1000)
 */
export async function* iterateRunsForExport(
  buildId: string,
  filter: RunExportFilter = {},
  batchSize = 1000,
  trx: Knex | Knex.Transaction = db(),
): AsyncGenerator<RunExportRow[]> {
  const size = Math.min(5000, Math.max(1, Math.floor(batchSize)));
  let after: { ts: string; id: string } | null = null;
  for (;;) {
    const q = exportQuery(buildId, filter, trx).limit(size);
    if (after) q.whereRaw("(r.created_at, r.id) < (?::timestamptz, ?::uuid)", [after.ts, after.id]);
    const rows: ExportDbRow[] = await q;
    if (rows.length > 0) yield rows.map(toExportRow);
    if (rows.length < size) return;
    const last = rows[rows.length - 1];
    after = { ts: last.cursor_ts, id: last.id };
  }
}

/** All matching runs at once (small builds, tests). */
export async function listRunsForExport(buildId: string, filter: RunExportFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<RunExportRow[]> {
  const out: RunExportRow[] = [];
  for await (const batch of iterateRunsForExport(buildId, filter, 1000, trx)) out.push(...batch);
  return out;
}
