"use server";

import { revalidatePath } from "next/cache";
import { stateFromError, type FormState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/current-user";
import { requestMeta } from "@/lib/auth/request-meta";
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
