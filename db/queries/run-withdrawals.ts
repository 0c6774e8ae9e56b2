import type { Knex } from "knex";
import { db } from "../index";

// Withdrawing a run sets three columns on it and nothing else: the capture, its analysis and its flags stay, so a
// withdrawal can always be undone. Every aggregate that must leave withdrawn runs out filters on withdrawn_at.

/** A run's withdrawal as the run page shows it. */
export interface RunWithdrawal {
  runId: string;
  buildId: string;
  withdrawnAt: Date;
  withdrawnBy: string;
  withdrawnByName: string;
  reason: string;
}

/**
 * Marks a run withdrawn, unless it is already.
 * @returns the build id of the run, or null when there is no such run or it was withdrawn already
 */
export async function withdrawRun(
  runId: string,
  input: { withdrawnBy: string; reason: string },
  trx: Knex | Knex.Transaction = db(),
): Promise<{ buildId: string } | null> {
  const rows = await trx("runs")
    .where({ id: runId })
    .whereNull("withdrawn_at")
    .update({ withdrawn_at: trx.fn.now(), withdrawn_by: input.withdrawnBy, withdrawal_reason: input.reason })
    .returning<{ build_id: string }[]>(["build_id"]);
  return rows[0] ? { buildId: rows[0].build_id } : null;
}

/**
 * Puts a withdrawn run back into the figures.
 * @returns what the withdrawal was (for the audit row), or null when the run is not withdrawn
 */
export async function restoreRun(runId: string, trx: Knex | Knex.Transaction = db()): Promise<RunWithdrawal | null> {
  const before = await getRunWithdrawal(runId, trx, { forUpdate: true });
  if (!before) return null;
  await trx("runs").where({ id: runId }).update({ withdrawn_at: null, withdrawn_by: null, withdrawal_reason: null });
  return before;
}

/** The withdrawal of a run, or null when the run counts (or does not exist). */
export async function getRunWithdrawal(
  runId: string,
  trx: Knex | Knex.Transaction = db(),
  options: { forUpdate?: boolean } = {},
): Promise<RunWithdrawal | null> {
  const query = trx("runs as r")
    .join("auth_user as u", "u.id", "r.withdrawn_by")
    .where("r.id", runId)
    .whereNotNull("r.withdrawn_at")
    .first<{ id: string; build_id: string; withdrawn_at: Date; withdrawn_by: string; name: string; withdrawal_reason: string } | undefined>(
      "r.id",
      "r.build_id",
      "r.withdrawn_at",
      "r.withdrawn_by",
      "u.name",
      "r.withdrawal_reason",
    );
  if (options.forUpdate) query.forUpdate("r");
  const row = await query;
  return row
    ? { runId: row.id, buildId: row.build_id, withdrawnAt: row.withdrawn_at, withdrawnBy: row.withdrawn_by, withdrawnByName: row.name, reason: row.withdrawal_reason }
    : null;
}
