import type { Knex } from "knex";
import { db } from "../index";

/** A spec rule a run broke. `margin` is negative (outside the limit) in `unit`; null for warnings. */
export interface Flag {
  id: string;
  runId: string;
  buildId: string;
  rule: string;
  measured: number | null;
  limit: number | null;
  margin: number | null;
  unit: string;
  message: string;
  acknowledgedBy: string | null;
  acknowledgedByName: string | null;
  acknowledgedAt: Date | null;
  createdAt: Date;
}

interface FlagRow {
  id: string;
  run_id: string;
  build_id: string;
  rule: string;
  measured: number | null;
  limit: number | null;
  margin: number | null;
  unit: string;
  message: string;
  acknowledged_by: string | null;
  acknowledged_by_name: string | null;
  acknowledged_at: Date | null;
  created_at: Date;
}

function toFlag(row: FlagRow): Flag {
  return {
    id: row.id,
    runId: row.run_id,
    buildId: row.build_id,
    rule: row.rule,
    measured: row.measured,
    limit: row.limit,
    margin: row.margin,
    unit: row.unit,
    message: row.message,
    acknowledgedBy: row.acknowledged_by,
    acknowledgedByName: row.acknowledged_by_name,
    acknowledgedAt: row.acknowledged_at,
    createdAt: row.created_at,
  };
}

/**
 * A flag from a row that came as JSON (`row_to_json` / `json_agg` of the flag columns and acknowledged_by_name),
 * so a query that returns a run can bring its flags in the same round trip. JSON carries times as text.
 */
export function flagFromJsonRow(row: Omit<FlagRow, "acknowledged_at" | "created_at"> & { acknowledged_at: string | null; created_at: string }): Flag {
  return toFlag({ ...row, acknowledged_at: row.acknowledged_at === null ? null : new Date(row.acknowledged_at), created_at: new Date(row.created_at) });
}

/** The SQL of a run's flags as one JSON array in flag order, for a subquery on `runs as r`. */
export const RUN_FLAGS_JSON_SQL = `(select coalesce(json_agg(x order by x.created_at, x.rule), '[]'::json)
  from (select f.*, fu.name as acknowledged_by_name from flags f left join auth_user fu on fu.id = f.acknowledged_by where f.run_id = r.id) x)`;

function flagQuery(trx: Knex | Knex.Transaction) {
  return trx("flags as f").leftJoin("auth_user as u", "u.id", "f.acknowledged_by").select("f.*", "u.name as acknowledged_by_name");
}

export async function listRunFlags(runId: string, trx: Knex | Knex.Transaction = db()): Promise<Flag[]> {
  const rows: FlagRow[] = await flagQuery(trx).where("f.run_id", runId).orderBy("f.created_at").orderBy("f.rule");
  return rows.map(toFlag);
}

export async function listBuildFlags(
  buildId: string,
  filter: { unacknowledgedOnly?: boolean } = {},
  trx: Knex | Knex.Transaction = db(),
): Promise<Flag[]> {
  const q = flagQuery(trx).where("f.build_id", buildId);
  if (filter.unacknowledgedOnly) q.whereNull("f.acknowledged_at");
  const rows: FlagRow[] = await q.orderBy("f.created_at", "desc").orderBy("f.rule");
  return rows.map(toFlag);
}

export interface FlagInput {
  rule: string;
  measured: number | null;
  limit: number | null;
  margin: number | null;
  unit: string;
  message: string;
}

/** Replaces a run's flags with the ones its latest analysis raised (a re-analysis must not keep stale flags). */
export async function replaceRunFlags(runId: string, buildId: string, flags: FlagInput[], trx: Knex | Knex.Transaction = db()): Promise<Flag[]> {
  await trx("flags").where({ run_id: runId }).delete();
  if (flags.length > 0) {
    await trx("flags").insert(
      flags.map((f) => ({
        run_id: runId,
        build_id: buildId,
        rule: f.rule,
        measured: f.measured,
        limit: f.limit,
        margin: f.margin,
        unit: f.unit,
        message: f.message,
      })),
    );
  }
  return listRunFlags(runId, trx);
}

export async function acknowledgeFlag(id: string, userId: string, trx: Knex | Knex.Transaction = db()): Promise<Flag | null> {
  const count = await trx("flags").where({ id }).whereNull("acknowledged_at").update({ acknowledged_by: userId, acknowledged_at: trx.fn.now() });
  if (!count) return null;
  const row = await flagQuery(trx).where("f.id", id).first<FlagRow | undefined>();
  return row ? toFlag(row) : null;
}
