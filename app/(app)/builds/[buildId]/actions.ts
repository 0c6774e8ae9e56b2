"use server";

import { revalidatePath } from "next/cache";
import type { RegisterResult, UploadRequest, UploadSlotResult } from "@/components/logbook/upload-types";
import type { FormState } from "@/lib/auth/action-state";
import { stateFromError } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/current-user";
import { requestMeta } from "@/lib/auth/request-meta";
import { zodFields } from "@/lib/http/problem";
import { failedForm, formObject, invalidForm } from "@/lib/logbook/action-helpers";
import { applyPlannedTweak, logTweak } from "@/lib/logbook/tweaks";
import { setBuildTimebase } from "@/lib/logbook/builds";
import { timebaseInputSchema } from "@/lib/validations/timebase";
import { cancelUpload, completePhotoUpload, completeUpload, requestPhotoSlot, requestUploadSlot } from "@/lib/logbook/uploads";
import { photoSlotRequestSchema } from "@/lib/validations/build";
import { idSchema } from "@/lib/validations/common";
import { runMetadataSchema, uploadSlotRequestSchema } from "@/lib/validations/run";

async function actor() {
  return { user: await getCurrentUser(), ip: (await requestMeta()).ip };
}

/**
 * Logs a tweak (technician and above); bind the build id. Fields: partRef, toValue (e.g. "4n7"), note, planned.
 * The "from" value is the build's as-built value, taken on the server.
 */
export async function createTweakAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const tweak = await logTweak(await actor(), buildId, formObject(formData));
    revalidatePath(`/builds/${buildId}`);
    return { ok: true, message: tweak.planned ? "Planned tweak saved." : "Tweak logged; the as-built values are updated." };
  } catch (err) {
    return failedForm(err, formData);
  }
}

/** Applies a planned tweak (technician and above); bind the build id; field `tweakId`. */
export async function applyPlannedTweakAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const tweakId = idSchema.safeParse(formData.get("tweakId"));
    if (!tweakId.success) return { message: "That tweak is not there any more." };
    await applyPlannedTweak(await actor(), tweakId.data);
    revalidatePath(`/builds/${buildId}`);
    return { ok: true, message: "Tweak applied; the as-built values are updated." };
  } catch (err) {
    return stateFromError(err);
  }
}

/** Sets or clears the build's scope timebase accuracy (technician and above); bind the build id; field `timebasePpm`. */
export async function setTimebaseAction(buildId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  const parsed = timebaseInputSchema.safeParse({ timebasePpm: formData.get("timebasePpm") ?? "" });
  if (!parsed.success) return invalidForm(parsed.error, formData);
  try {
    const build = await setBuildTimebase(await actor(), buildId, parsed.data.timebasePpm);
    revalidatePath(`/builds/${buildId}`);
    return { ok: true, message: build.timebasePpm === null ? "Timebase accuracy cleared." : `Saved: ±${build.timebasePpm} ppm.` };
  } catch (err) {
    return failedForm(err, formData);
  }
}

/**
 * A presigned PUT for a capture (technician and above): the browser sends the file straight to object storage
 * with the returned headers, then calls {@link registerRunAction} with the slot id.
 */
export async function requestCaptureUploadAction(buildId: string, request: UploadRequest): Promise<UploadSlotResult> {
  try {
    const parsed = uploadSlotRequestSchema.safeParse({ ...request, buildId });
    if (!parsed.success) return { ok: false, message: Object.values(zodFields(parsed.error)).flat().join(" ") };
    const ticket = await requestUploadSlot(await actor(), parsed.data);
    return { ok: true, slotId: ticket.slotId, uploadUrl: ticket.url, headers: ticket.headers };
  } catch (err) {
    return { ok: false, message: stateFromError(err).message ?? "The upload could not start." };
  }
}

/**
 * Registers an uploaded capture as a run and queues its analysis (technician and above). A file already logged
 * on this build comes back as `duplicateOf`; call again with `keepDuplicate: true` to keep a second copy.
 */
export async function registerRunAction(slotId: string, details: unknown): Promise<RegisterResult> {
  try {
    const parsed = runMetadataSchema.safeParse(details ?? {});
    if (!parsed.success) return { ok: false, message: "Check the highlighted fields.", errors: zodFields(parsed.error) };
    const outcome = await completeUpload(await actor(), slotId, parsed.data);
    if (outcome.kind === "duplicate") {
      const e = outcome.existing;
      return {
        ok: false,
        duplicateOf: { runId: e.id, createdAt: e.createdAt, originalFilename: e.originalFilename },
        message: `This file is already logged on this build (${e.originalFilename}).`,
      };
    }
    revalidatePath(`/builds/${outcome.run.buildId}`);
    return { ok: true, runId: outcome.run.id };
  } catch (err) {
    const state = stateFromError(err);
    return { ok: false, message: state.message ?? "The run could not be registered.", errors: state.errors };
  }
}

/** Drops an upload the user cancelled (the slot and any bytes that reached storage). */
export async function cancelUploadAction(slotId: string): Promise<{ ok: boolean }> {
  try {
    await cancelUpload(await actor(), slotId);
    return { ok: true };
  } catch {
    return { ok: false };
  }
}

/** A presigned PUT for a build photo (technician and above): contentType, sizeBytes, filename, caption. */
export async function requestPhotoUploadAction(buildId: string, request: unknown): Promise<UploadSlotResult> {
  try {
    const parsed = photoSlotRequestSchema.safeParse(request);
    if (!parsed.success) return { ok: false, message: Object.values(zodFields(parsed.error)).flat().join(" ") };
    const ticket = await requestPhotoSlot(await actor(), buildId, parsed.data);
    return { ok: true, slotId: ticket.slotId, uploadUrl: ticket.url, headers: ticket.headers };
  } catch (err) {
    return { ok: false, message: stateFromError(err).message ?? "The upload could not start." };
  }
}

/** Adds the uploaded photo to the build. */
export async function completePhotoUploadAction(buildId: string, slotId: string, caption: string): Promise<FormState> {
  try {
    await completePhotoUpload(await actor(), slotId, typeof caption === "string" ? caption.slice(0, 200) : "");
    revalidatePath(`/builds/${buildId}`);
    return { ok: true, message: "Photo added." };
  } catch (err) {
    return stateFromError(err);
  }
}
