import { db } from "@/db/index";
import * as q from "@/db/queries/run-withdrawals";
import { getRun } from "@/db/queries/runs";
import { requirePermission } from "@/lib/auth/require-permission";
import { ConflictError, NotFoundError } from "@/lib/errors";
import { runWithdrawalInputSchema } from "@/lib/validations/run-withdrawal";
import { audit, isId, type Actor } from "./context";

// Withdrawing takes a run out of the figures (the lab's layouts, the build's drift trend and verdict, the
// comparison's default run) without deleting anything; restoring puts it back. Both are audited with the reason.

/**
 * Withdraws a run (whoever may edit its build: technician and above).
 * @param input - `{reason}`, checked here (zod) whether it came from a form or the API
 * @throws NotFoundError; ConflictError when it is withdrawn already; ZodError for a missing or blank reason
 */
export async function withdrawRun(actor: Actor, runId: string, input: unknown): Promise<q.RunWithdrawal> {
  const user = requirePermission(actor.user, "run:withdraw");
  const { reason } = runWithdrawalInputSchema.parse(input);
  if (!isId(runId)) throw new NotFoundError("The run");
  return db().transaction(async (trx) => {
    const run = await getRun(runId, trx);
    if (!run) throw new NotFoundError("The run");
    const done = await q.withdrawRun(runId, { withdrawnBy: user.id, reason }, trx);
    if (!done) throw new ConflictError("This run is withdrawn already; restore it first to withdraw it with another reason.");
    await audit({ ...actor, user }, "run.withdrawn", { type: "run", id: runId }, { buildId: run.buildId, reason }, trx);
    return (await q.getRunWithdrawal(runId, trx))!;
  });
}

/**
 * Restores a withdrawn run into the figures (technician and above).
 * @returns the build id of the run
 * @throws NotFoundError; ConflictError when the run is not withdrawn
 */
export async function restoreRun(actor: Actor, runId: string): Promise<{ runId: string; buildId: string }> {
  const user = requirePermission(actor.user, "run:withdraw");
  if (!isId(runId)) throw new NotFoundError("The run");
  return db().transaction(async (trx) => {
    const run = await getRun(runId, trx);
    if (!run) throw new NotFoundError("The run");
    const before = await q.restoreRun(runId, trx);
    if (!before) throw new ConflictError("This run is not withdrawn; it counts in the figures already.");
    await audit(
      { ...actor, user },
      "run.restored",
      { type: "run", id: runId },
      { buildId: run.buildId, withdrawnAt: before.withdrawnAt, withdrawnBy: before.withdrawnBy, reason: before.reason },
      trx,
    );
    return { runId, buildId: run.buildId };
  });
}

/** A run's withdrawal, or null while it counts. */
export async function getRunWithdrawal(runId: string): Promise<q.RunWithdrawal | null> {
  return isId(runId) ? q.getRunWithdrawal(runId) : null;
}
