import type { Knex } from "knex";
import { db } from "../index";

/** One spec rule of a build whose failure has been e-mailed and has not passed since. */
export interface AlertState {
  buildId: string;
  rule: string;
  runId: string | null;
  alertedAt: Date;
}

interface AlertStateRow {
  build_id: string;
  rule: string;
  run_id: string | null;
  alerted_at: Date;
}

function toAlertState(row: AlertStateRow): AlertState {
  return { buildId: row.build_id, rule: row.rule, runId: row.run_id, alertedAt: row.alerted_at };
}

/**
 * Locks the build's row for the rest of the transaction, so two analyses of the same build finishing together
 * decide their alerts one after the other.
 * @returns false when the build is gone
 */
export async function lockBuildForAlerts(buildId: string, trx: Knex.Transaction): Promise<boolean> {
  const row = await trx("builds").where({ id: buildId }).forUpdate().first("id");
  return row !== undefined;
}

/**
 * The id of the build's newest analysed run (status done, by upload time): the run whose flags say which rules
 * fail now. An older run analysed again later does not speak for the build.
 */
export async function getLatestAnalysedRunId(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<string | null> {
  const row = await trx("runs").where({ build_id: buildId, status: "done" }).orderBy("created_at", "desc").orderBy("id", "desc").first("id");
  return row?.id ?? null;
}

export async function listAlertState(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<AlertState[]> {
  const rows: AlertStateRow[] = await trx("alert_state").where({ build_id: buildId }).orderBy("rule");
  return rows.map(toAlertState);
}

/**
 * Forgets the alerts of rules that no longer fail, so their next failure e-mails again.
 * @param failingRules - the rules the build's latest analysed run flags
 * @returns the rules cleared
 */
export async function clearPassedAlerts(buildId: string, failingRules: string[], trx: Knex | Knex.Transaction = db()): Promise<string[]> {
  const q = trx("alert_state").where({ build_id: buildId });
  if (failingRules.length > 0) q.whereNotIn("rule", failingRules);
  const rows: { rule: string }[] = await q.delete().returning("rule");
  return rows.map((r) => r.rule).sort();
}

/**
 * Marks rules as alerted for this build, keeping earlier marks.
 * @returns the rules that were not marked before (the newly failing ones, to e-mail about)
 */
export async function claimAlerts(buildId: string, runId: string, rules: string[], trx: Knex | Knex.Transaction = db()): Promise<string[]> {
  if (rules.length === 0) return [];
  const rows: { rule: string }[] = await trx("alert_state")
    .insert(rules.map((rule) => ({ build_id: buildId, rule, run_id: runId })))
    .onConflict(["build_id", "rule"])
    .ignore()
    .returning("rule");
  return rows.map((r) => r.rule).sort();
}

/** Takes back marks {@link claimAlerts} made for this run (no e-mail went out), so a later failing run e-mails. */
export async function releaseAlerts(buildId: string, runId: string, rules: string[], trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("alert_state").where({ build_id: buildId, run_id: runId }).whereIn("rule", rules).delete();
}
