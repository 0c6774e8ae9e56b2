import { randomUUID } from "node:crypto";
import { db } from "@/db/index";
import { createBuildPhoto, getBuild, type BuildPhoto } from "@/db/queries/builds";
import { getRun } from "@/db/queries/runs";
import * as q from "@/db/queries/uploads";
import { requirePermission } from "@/lib/auth/require-permission";
import { BadRequestError, NotFoundError } from "@/lib/errors";
import { captureObjectKey, deleteObject, headObject, photoObjectKey, presignPut } from "@/lib/storage";
import { PHOTO_LIMIT_BYTES } from "@/lib/validations/build";
import type { RunMetadata, UploadSlotRequest } from "@/lib/validations/run";
import { checkCaptureFile, checkCaptureSize, uploadLimitBytes } from "./capture-files";
import { audit, isId, type Actor } from "./context";
import { registerRun, type RegisterOutcome } from "./runs";

/** How long a presigned PUT stays valid: long enough for a large file on a slow bench network. */
const SLOT_SECONDS = 3600;
/** The Content-Type the presigned URL is signed for; the PUT must send exactly this. */
export const CAPTURE_CONTENT_TYPE = "text/csv";

/** What the browser needs to PUT the file straight to storage. */
export interface UploadSlotTicket {
  slotId: string;
  /** The run's id once registered. */
  runId: string;
  key: string;
  url: string;
  method: "PUT";
  /** Headers the PUT must carry (the URL is signed for them). */
  headers: Record<string, string>;
  expiresAt: Date;
  maxBytes: number;
}

/**
 * Hands out a presigned PUT for a capture (technician and above). The server picks the object key (from the
 * future run's id) and signs the exact size, so the bytes can go nowhere else and be no bigger.
 * @throws NotFoundError; PayloadTooLargeError over UPLOAD_LIMIT_BYTES; UnsupportedMediaTypeError for a non-CSV name
 */
export async function requestUploadSlot(actor: Actor, request: UploadSlotRequest): Promise<UploadSlotTicket> {
  const user = requirePermission(actor.user, "run:upload");
  const build = await getBuild(request.buildId);
  if (!build) throw new NotFoundError("The build");
  checkCaptureFile(request.filename, request.contentType);
  checkCaptureSize(request.sizeBytes);
  const runId = randomUUID();
  const key = captureObjectKey(runId);
  const url = await presignPut(key, { contentType: CAPTURE_CONTENT_TYPE, expiresInSeconds: SLOT_SECONDS, sizeBytes: request.sizeBytes });
  const slot = await db().transaction(async (trx) => {
    const created = await q.createUploadSlot(
      {
        purpose: "capture",
        objectKey: key,
        reservedId: runId,
        userId: user.id,
        buildId: build.id,
        contentType: CAPTURE_CONTENT_TYPE,
        sizeBytes: request.sizeBytes,
        originalFilename: request.filename,
        expiresAt: new Date(Date.now() + SLOT_SECONDS * 1000),
      },
      trx,
    );
    await audit({ ...actor, user }, "upload.slot-created", { type: "build", id: build.id }, { slotId: created.id, filename: request.filename, sizeBytes: request.sizeBytes }, trx);
    return created;
  });
  return {
    slotId: slot.id,
    runId,
    key,
    url,
    method: "PUT",
    headers: { "content-type": CAPTURE_CONTENT_TYPE },
    expiresAt: slot.expiresAt,
    maxBytes: uploadLimitBytes(),
  };
}

async function ownSlot(actor: Actor & { user: { id: string } }, slotId: string, purpose: q.UploadPurpose): Promise<q.UploadSlot> {
  const slot = isId(slotId) ? await q.getUploadSlot(slotId) : null;
  // Someone else's slot is "not found": its existence is nobody else's business.
  if (!slot || slot.userId !== actor.user.id || slot.purpose !== purpose) throw new NotFoundError("The upload");
  return slot;
}

/**
 * Registers the capture PUT through a slot as a run (see registerRun). Completing a completed slot again returns
 * its run; a duplicate leaves the slot open, so the user can confirm with `keepDuplicate` without uploading again.
 * @throws NotFoundError; BadRequestError when the slot expired or the file is not there
 */
export async function completeUpload(actor: Actor, slotId: string, meta: RunMetadata): Promise<RegisterOutcome> {
  const user = requirePermission(actor.user, "run:upload");
  const slot = await ownSlot({ ...actor, user }, slotId, "capture");
  if (slot.completedAt) {
    const run = await getRun(slot.reservedId);
    if (run) return { kind: "created", run };
  }
  if (slot.expiresAt.getTime() < Date.now()) throw new BadRequestError("This upload expired; choose the file again.", { file: ["upload expired"] });
  return registerRun(actor, {
    runId: slot.reservedId,
    buildId: slot.buildId,
    objectKey: slot.objectKey,
    originalFilename: slot.originalFilename,
    expectedSizeBytes: slot.sizeBytes,
    meta,
    slotId: slot.id,
  });
}

/** A presigned PUT for a build photo (technician and above). */
export async function requestPhotoSlot(
  actor: Actor,
  buildId: string,
  request: { contentType: "image/jpeg" | "image/png" | "image/webp"; sizeBytes: number; filename: string },
): Promise<UploadSlotTicket> {
  const user = requirePermission(actor.user, "build:create");
  const build = isId(buildId) ? await getBuild(buildId) : null;
  if (!build) throw new NotFoundError("The build");
  const photoId = randomUUID();
  const key = photoObjectKey(build.id, request.contentType);
  const url = await presignPut(key, { contentType: request.contentType, expiresInSeconds: SLOT_SECONDS, sizeBytes: request.sizeBytes, maxBytes: PHOTO_LIMIT_BYTES });
  const slot = await q.createUploadSlot({
    purpose: "photo",
    objectKey: key,
    reservedId: photoId,
    userId: user.id,
    buildId: build.id,
    contentType: request.contentType,
    sizeBytes: request.sizeBytes,
    originalFilename: request.filename,
    expiresAt: new Date(Date.now() + SLOT_SECONDS * 1000),
  });
  return { slotId: slot.id, runId: photoId, key, url, method: "PUT", headers: { "content-type": request.contentType }, expiresAt: slot.expiresAt, maxBytes: PHOTO_LIMIT_BYTES };
}

/** Records a photo PUT through its slot on the build. */
export async function completePhotoUpload(actor: Actor, slotId: string, caption: string): Promise<BuildPhoto> {
  const user = requirePermission(actor.user, "build:create");
  const slot = await ownSlot({ ...actor, user }, slotId, "photo");
  if (slot.completedAt) throw new BadRequestError("This photo is already on the build.");
  const info = await headObject(slot.objectKey);
  if (!info || info.sizeBytes !== slot.sizeBytes) throw new BadRequestError("The photo has not arrived in storage; upload it again.", { file: ["not uploaded"] });
  return db().transaction(async (trx) => {
    const photo = await createBuildPhoto(
      { id: slot.reservedId, buildId: slot.buildId, objectKey: slot.objectKey, contentType: slot.contentType, sizeBytes: info.sizeBytes, caption, uploadedBy: user.id },
      trx,
    );
    await q.markUploadSlotCompleted(slot.id, trx);
    await audit({ ...actor, user }, "build.photo-added", { type: "build", id: slot.buildId }, { photoId: photo.id }, trx);
    return photo;
  });
}

/**
 * Drops an upload the user gave up on: the slot and whatever part of the object reached storage.
 * A completed slot is left alone (its run owns the object).
 */
export async function cancelUpload(actor: Actor, slotId: string): Promise<void> {
  const user = requirePermission(actor.user, "run:upload");
  const slot = await ownSlot({ ...actor, user }, slotId, "capture");
  if (slot.completedAt) return;
  await deleteObject(slot.objectKey);
  await q.deleteUploadSlot(slot.id);
}
