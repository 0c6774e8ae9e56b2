// One run as its detail, the upload's duplicate check and the plot route read it.
import type { Knex } from "knex";
import { flagFromJsonRow, RUN_FLAGS_JSON_SQL, type Flag } from "./flags";
import { RUN_TWEAK_JSON_SQL, tweakFromJsonRow, type Tweak } from "./tweaks";
import { db } from "../index";
import type { JoinedRead } from "./joined-read";
import { fullQuery, toRun, type Run, type RunRow } from "./run-rows";

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

export interface RunWithContext {
  run: Run;
  build: RunBuildNames;
  flags: Flag[];
  tweak: Tweak | null;
}

function runWithContextQuery(knex: Knex | Knex.Transaction, id: string) {
  return fullQuery(knex)
    .join("builds as b", "b.id", "r.build_id")
    .join("designs as d", "d.id", "b.design_id")
    .join("projects as p", "p.id", "d.project_id")
    .select(
      "b.label as build_label",
      "b.design_id as build_design_id",
      "d.name as build_design_name",
      "d.project_id as build_project_id",
      "p.name as build_project_name",
      knex.raw(`${RUN_FLAGS_JSON_SQL} as flag_rows`),
      knex.raw(`${RUN_TWEAK_JSON_SQL} as tweak_row`),
    )
    .where("r.id", id);
}

function toRunWithContext(row: RunRow & Record<string, any>): RunWithContext {
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

/**
 * A run with what its detail shows beside it: its build's names, its flags (in flag order) and its tweak, in one
 * query instead of four (the run's detail is the API's most requested read).
 * @returns null for an unknown run
 */
export async function getRunWithContext(id: string, trx: Knex | Knex.Transaction = db()): Promise<RunWithContext | null> {
  const row = await runWithContextQuery(trx, id).first<(RunRow & Record<string, any>) | undefined>();
  return row ? toRunWithContext(row) : null;
}

/** {@link getRunWithContext} as a read that can join the caller's token lookup (joined-read.ts). */
export function runWithContextRead(id: string): JoinedRead<RunWithContext | null> {
  return {
    rows: (knex) => runWithContextQuery(knex, id),
    map: (rows) => (rows[0] ? toRunWithContext(rows[0] as RunRow & Record<string, any>) : null),
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
