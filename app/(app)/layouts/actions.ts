"use server";

import { revalidatePath } from "next/cache";
import { ZodError } from "zod";
import { fieldErrors, stateFromError, type FormState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/current-user";
import { proposeDesignValues, type DesignValueProposals } from "@/lib/logbook/layouts";
import { chooseRetuneAim } from "@/lib/logbook/retune-aim";
import type { ValueProposalRequest } from "@/lib/validations/layouts";

/** The answer of the design form's "propose values" step: proposals, or what was wrong with the request. */
export type ProposeValuesResult = { ok: true; result: DesignValueProposals } | { ok: false; message: string; errors?: Record<string, string[]> };

/** Standard values that land a new design on its target as built on the chosen construction here (engineer and above). */
export async function proposeDesignValuesAction(input: ValueProposalRequest): Promise<ProposeValuesResult> {
  try {
    return { ok: true, result: await proposeDesignValues(await getCurrentUser(), input) };
  } catch (err) {
    if (err instanceof ZodError) return { ok: false, message: "Check the highlighted fields.", errors: fieldErrors(err) };
    const state = stateFromError(err);
    return { ok: false, message: state.message ?? "The values could not be proposed.", errors: state.errors };
  }
}

/** Remembers how the person's retune card aims (field `aim`: measured or lab); bind the build id to refresh its page. */
export async function chooseRetuneAimAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const aim = await chooseRetuneAim(await getCurrentUser(), formData.get("aim"));
    revalidatePath(`/builds/${buildId}`);
    return { ok: true, message: aim === "lab" ? "The retune now aims with the lab's figure for this construction." : "The retune now aims with this build's own run." };
  } catch (err) {
    return stateFromError(err);
  }
}
