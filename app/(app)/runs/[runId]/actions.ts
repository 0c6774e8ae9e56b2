"use server";

import { revalidatePath } from "next/cache";
import { ZodError } from "zod";
import { invalidState, stateFromError, type FormState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/current-user";
import { requestMeta } from "@/lib/auth/request-meta";
import { restoreRun, withdrawRun } from "@/lib/logbook/run-withdrawal";
import { reanalyseRun } from "@/lib/logbook/runs";

/** Queues a finished run for analysis again (technician and above); bind the run id. */
export async function reanalyseRunAction(runId: string, _prev?: FormState, _formData?: FormData): Promise<FormState> {
  try {
    const run = await reanalyseRun({ user: await getCurrentUser(), ip: (await requestMeta()).ip }, runId);
    revalidatePath(`/runs/${runId}`);
    revalidatePath(`/builds/${run.buildId}`);
    return { ok: true, message: "Queued for analysis again; this page updates when it is done." };
  } catch (err) {
    return stateFromError(err);
  }
}

/** Withdraws a run from the figures with a reason (the roles that edit the build); bind the run id. */
export async function withdrawRunAction(runId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const w = await withdrawRun({ user: await getCurrentUser(), ip: (await requestMeta()).ip }, runId, { reason: formData.get("reason") });
    revalidatePath(`/runs/${runId}`);
    revalidatePath(`/builds/${w.buildId}`);
    return { ok: true, message: "Withdrawn: the build's figures leave this run out now." };
  } catch (err) {
    if (err instanceof ZodError) return invalidState(err);
    return stateFromError(err);
  }
}

/** Restores a withdrawn run into the figures; bind the run id. */
export async function restoreRunAction(runId: string, _prev?: FormState, _formData?: FormData): Promise<FormState> {
  try {
    const { buildId } = await restoreRun({ user: await getCurrentUser(), ip: (await requestMeta()).ip }, runId);
    revalidatePath(`/runs/${runId}`);
    revalidatePath(`/builds/${buildId}`);
    return { ok: true, message: "Restored: this run counts in the figures again." };
  } catch (err) {
    return stateFromError(err);
  }
}
