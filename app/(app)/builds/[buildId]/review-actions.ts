"use server";

import { revalidatePath } from "next/cache";
import type { FormState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/current-user";
import { requestMeta } from "@/lib/auth/request-meta";
import { getBuild } from "@/db/queries/builds";
import { getDesign } from "@/db/queries/designs";
import { retuneAimFor } from "@/lib/logbook/retune-aim";
import { failedForm, formObject, invalidForm } from "@/lib/logbook/action-helpers";
import { acknowledgeFlag, followBuild, followProject, planRetuneTweak, reviewBuild, unfollowBuild } from "@/lib/logbook/review";
import { formatEngineering } from "@/lib/oscillator/units";
import type { ESeriesName } from "@/lib/oscillator/e-series";
import { buildFollowSchema, buildReviewInputSchema, flagAcknowledgeSchema, projectFollowSchema, retunePlanSchema } from "@/lib/validations/review";

// Sign-off, flags, follows and the planned retune, for the build page's forms. Every action returns
// `{ errors, message }` form state (errors keyed by field name), and the services check the role themselves.

function buildPaths(buildId: string, projectId?: string, designId?: string): void {
  revalidatePath(`/builds/${buildId}`);
  if (projectId) revalidatePath(`/projects/${projectId}`);
  if (projectId && designId) revalidatePath(`/projects/${projectId}/designs/${designId}`);
  revalidatePath("/dashboard");
}

/**
 * Accepts, rejects or reopens the build (engineer and above); bind the build id.
 * Fields: `decision` (accept | reject | reopen; or `status` accepted | rejected | open), `comment` (required to
 * reject), `reason` (required to accept a build whose latest run is flagged: the error comes back on `reason`).
 */
export async function signOffBuildAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const parsed = buildReviewInputSchema.safeParse(formObject(formData));
    if (!parsed.success) return invalidForm(parsed.error, formData);
    const out = await reviewBuild(await getCurrentUser(), { buildId, ...parsed.data }, await requestMeta());
    buildPaths(buildId, out.build.projectId, out.build.designId);
    const message =
      out.build.status === "open"
        ? "The build is open again."
        : out.build.status === "rejected"
          ? "Build rejected."
          : out.flaggedRules.length > 0
            ? `Build accepted despite ${out.flaggedRules.length === 1 ? "a flagged rule" : `${out.flaggedRules.length} flagged rules`}; the reason is in the audit log.`
            : "Build accepted.";
    return { ok: true, message };
  } catch (err) {
    return failedForm(err, formData);
  }
}

/** Acknowledges one flag (engineer and above); bind the build id. Field: `flagId`. */
export async function acknowledgeFlagAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const parsed = flagAcknowledgeSchema.safeParse(formObject(formData));
    if (!parsed.success) return invalidForm(parsed.error, formData);
    const flag = await acknowledgeFlag(await getCurrentUser(), parsed.data, await requestMeta());
    buildPaths(buildId);
    revalidatePath(`/runs/${flag.runId}`);
    return { ok: true, message: "Flag acknowledged." };
  } catch (err) {
    return failedForm(err, formData);
  }
}

/** Follows or unfollows the build (any signed-in role); bind the build id. Field: `following` (true | false). */
export async function followBuildAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const parsed = buildFollowSchema.safeParse({ ...formObject(formData), buildId });
    if (!parsed.success) return invalidForm(parsed.error, formData);
    const change = parsed.data.following ? followBuild : unfollowBuild;
    const status = await change(await getCurrentUser(), { buildId }, await requestMeta());
    buildPaths(buildId);
    return { ok: true, message: status.following ? "You follow this build: its flags are e-mailed to you." : "You no longer follow this build." };
  } catch (err) {
    return failedForm(err, formData);
  }
}

/** Follows or unfollows a whole project (any signed-in role); bind the project id. Field: `following`. */
export async function followProjectAction(projectId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const parsed = projectFollowSchema.safeParse({ ...formObject(formData), projectId });
    if (!parsed.success) return invalidForm(parsed.error, formData);
    const out = await followProject(await getCurrentUser(), parsed.data, await requestMeta());
    revalidatePath(`/projects/${projectId}`);
    return { ok: true, message: out.following ? "You follow this project: flags on any of its builds are e-mailed to you." : "You no longer follow this project." };
  } catch (err) {
    return failedForm(err, formData);
  }
}

/** Logs the retune suggestion as a planned tweak in one click (technician and above); bind the build id. Field: `series` (optional, default E12). */
export async function planRetuneTweakAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const parsed = retunePlanSchema.safeParse({ ...formObject(formData), buildId });
    if (!parsed.success) return invalidForm(parsed.error, formData);
    const user = await getCurrentUser();
    // The tweak planned is the one the card shows: same series, same remembered aim.
    const build = await getBuild(buildId);
    const design = build ? await getDesign(build.designId) : null;
    const aim = build && design ? await retuneAimFor(user, build, design.topology) : null;
    const { tweak, created } = await planRetuneTweak(
      user,
      { buildId, series: parsed.data.series as ESeriesName | undefined, calibrationCapacitanceF: aim?.calibrationCapacitanceF },
      await requestMeta(),
    );
    buildPaths(buildId);
    const unit = tweak.partRef?.startsWith("L") ? "H" : "F";
    const to = tweak.toValue === null ? "" : ` to ${formatEngineering(tweak.toValue, unit, 3)}`;
    return { ok: true, message: created ? `Planned: change ${tweak.partRef}${to}. Apply it when the part is fitted.` : `Already planned: change ${tweak.partRef}${to}.` };
  } catch (err) {
    return failedForm(err, formData);
  }
}
