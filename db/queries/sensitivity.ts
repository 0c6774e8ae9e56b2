import type { Knex } from "knex";
import type { Topology, WindingSense } from "@/lib/oscillator/design";
import type { Parts } from "./designs";
import { db } from "../index";

/** One analysed run with what the across-runs figures read: frequency, its 1σ, amplitude, conditions, warnings, state. */
export interface SensitivityRunRow {
  id: string;
  createdAt: Date;
  originalFilename: string;
  measuredHz: number | null;
  frequencyUncertaintyHz: number | null;
  fundamentalVpk: number | null;
  supplyV: number | null;
  temperatureC: number | null;
  /** The analysis's trust warning codes, in its order. */
  warningCodes: string[];
  /** The as-built values snapshotted at upload. */
  topology: Topology;
  parts: Parts;
  extraCapacitanceF: number | null;
  windings: WindingSense | null;
}

interface Row {
  id: string;
  created_at: Date;
  original_filename: string;
  measured_hz: number | null;
  frequency_uncertainty_hz: number | null;
  fundamental_vpk: number | null;
  supply_v: number | null;
  temperature_c: number | null;
  warning_codes: string[] | null;
  topology: Topology;
  parts: Parts;
  extra_capacitance_f: number | null;
  windings: WindingSense | null;
}

/** Most runs one build's figures read (the newest); a build with more is characterised on its latest runs. */
export const SENSITIVITY_RUN_LIMIT = 1000;

/**
 * A build's analysed runs that are not withdrawn, oldest first, in one query: only what pushing, tempco and run-to-run stability need,
 * with the warning codes pulled out of the results in SQL so the whole result object never leaves the database.
 */
export async function listSensitivityRuns(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<SensitivityRunRow[]> {
  const rows: Row[] = await trx
    .select("*")
    .from(
      trx("runs as r")
        .where({ "r.build_id": buildId, "r.status": "done" })
        // A withdrawn run is kept in the log but leaves every figure of the build, these included.
        .whereNull("r.withdrawn_at")
        .select(
          "r.id",
          "r.created_at",
          "r.original_filename",
          "r.measured_hz",
          "r.frequency_uncertainty_hz",
          "r.fundamental_vpk",
          "r.supply_v",
          "r.temperature_c",
          trx.raw(`(select coalesce(json_agg(w->>'code'), '[]'::json) from jsonb_array_elements(coalesce(r.results->'warnings', '[]'::jsonb)) w) as warning_codes`),
          trx.raw(`r.snapshot->>'topology' as topology`),
          trx.raw(`r.snapshot->'parts' as parts`),
          trx.raw(`(r.snapshot->>'extraCapacitanceF')::double precision as extra_capacitance_f`),
          trx.raw(`r.snapshot->>'windings' as windings`),
        )
        .orderBy("r.created_at", "desc")
        .orderBy("r.id", "desc")
        .limit(SENSITIVITY_RUN_LIMIT)
        .as("newest"),
    )
    .orderBy("created_at")
    .orderBy("id");
  return rows.map((row) => ({
    id: row.id,
    createdAt: row.created_at,
    originalFilename: row.original_filename,
    measuredHz: row.measured_hz,
    frequencyUncertaintyHz: row.frequency_uncertainty_hz,
    fundamentalVpk: row.fundamental_vpk,
    supplyV: row.supply_v,
    temperatureC: row.temperature_c,
    warningCodes: row.warning_codes ?? [],
    topology: row.topology,
    parts: row.parts,
    extraCapacitanceF: row.extra_capacitance_f,
    windings: row.windings,
  }));
}
