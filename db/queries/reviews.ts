import type { Knex } from "knex";
import { db } from "../index";

/** What a sign-off was based on, beside the logbook's review columns (status, comment, who, when). */
export interface ReviewBasis {
  /** Why a build was accepted although its latest run was flagged; null otherwise. */
  reason: string | null;
  /** The latest analysed run when the decision was made; null when there was none (or it was deleted). */
  runId: string | null;
}

/** Stores the reason and the run a review was made against (called in the review's transaction). */
export async function setReviewBasis(buildId: string, basis: ReviewBasis, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("builds").where({ id: buildId }).update({ review_reason: basis.reason, reviewed_run_id: basis.runId });
}

export async function getReviewBasis(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<ReviewBasis | null> {
  const row = await trx("builds").where({ id: buildId }).first<{ review_reason: string | null; reviewed_run_id: string | null } | undefined>("review_reason", "reviewed_run_id");
  return row ? { reason: row.review_reason, runId: row.reviewed_run_id } : null;
}

/** The build and acknowledgement state of one flag, or null when there is no such flag. */
export async function getFlagTarget(flagId: string, trx: Knex | Knex.Transaction = db()): Promise<{ buildId: string; runId: string; rule: string; acknowledgedAt: Date | null } | null> {
  const row = await trx("flags").where({ id: flagId }).first<{ build_id: string; run_id: string; rule: string; acknowledged_at: Date | null } | undefined>("build_id", "run_id", "rule", "acknowledged_at");
  return row ? { buildId: row.build_id, runId: row.run_id, rule: row.rule, acknowledgedAt: row.acknowledged_at } : null;
}
