"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import type { FormState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/current-user";
import { requestMeta } from "@/lib/auth/request-meta";
import { failedForm, formObject, invalidForm } from "@/lib/logbook/action-helpers";
import { createBuild } from "@/lib/logbook/builds";
import { createDesign, getDesign, reviseDesign } from "@/lib/logbook/designs";
import { buildInputSchema } from "@/lib/validations/build";
import { designInputSchema, designPatchSchemaFor, everyDesignIssue } from "@/lib/validations/design";

// Design forms post dotted names mirroring designInputSchema: name, topology, windings, extraCapacitance,
// changeNote, parts.<REF>.value|tolerance|tempco, spec.targetHz|toleranceValue|toleranceUnit|maxThdPercent|
// maxHarmonicDbc|minFundamentalVpk|maxDriftPpm. Errors come back under the same dotted names.

async function actor() {
  return { user: await getCurrentUser(), ip: (await requestMeta()).ip };
}

/** New design in a project (engineer and above); bind the project id. Redirects to the design on success. */
export async function createDesignAction(projectId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  let designId: string;
  try {
    const raw = formObject(formData);
    const parsed = designInputSchema.safeParse(raw);
    // Every problem at once, so the form's summary lists them all (the schema alone stops at the first object).
    if (!parsed.success) return invalidForm(everyDesignIssue(raw, parsed.error), formData);
    designId = (await createDesign(await actor(), projectId, parsed.data)).id;
  } catch (err) {
    return failedForm(err, formData);
  }
  revalidatePath(`/projects/${projectId}`);
  redirect(`/projects/${projectId}/designs/${designId}`);
}

/**
 * Saves an edit as a new revision (engineer and above); bind the design id. Parts given replace those refs; the
 * spec fields given replace the spec. Redirects to the design on success.
 */
export async function updateDesignAction(designId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  let projectId: string;
  try {
    const who = await actor();
    const design = await getDesign(who.user, designId);
    projectId = design.projectId;
    const fields = formObject(formData);
    delete fields.topology;
    const parsed = designPatchSchemaFor(design.topology).safeParse(fields);
    if (!parsed.success) return invalidForm(parsed.error, formData);
    await reviseDesign(who, designId, parsed.data);
  } catch (err) {
    return failedForm(err, formData);
  }
  revalidatePath(`/projects/${projectId}`);
  revalidatePath(`/projects/${projectId}/designs/${designId}`);
  redirect(`/projects/${projectId}/designs/${designId}`);
}

/** New build of a design (technician and above): label, kind, kindRevision, builtBy (optional); bind the design id. */
export async function createBuildAction(designId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  let buildId: string;
  let projectId: string;
  try {
    const parsed = buildInputSchema.safeParse(formObject(formData));
    if (!parsed.success) return invalidForm(parsed.error, formData);
    const build = await createBuild(await actor(), designId, parsed.data);
    buildId = build.id;
    projectId = build.projectId;
  } catch (err) {
    return failedForm(err, formData);
  }
  revalidatePath(`/projects/${projectId}`);
  revalidatePath(`/projects/${projectId}/designs/${designId}`);
  redirect(`/builds/${buildId}`);
}
