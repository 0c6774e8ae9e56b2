import { randomUUID } from "node:crypto";

// Object keys are built here from server-side ids only, never from a user's file name, so a key can
// neither escape its prefix nor collide with another upload.
const ID_RULE = /^[A-Za-z0-9_-]{1,64}$/;

const PHOTO_EXTENSIONS: Record<string, string> = {
  "image/jpeg": "jpg",
  "image/png": "png",
  "image/webp": "webp",
};

function checkId(name: string, value: string): void {
  if (!ID_RULE.test(value)) {
    throw new TypeError(`${name} must be 1-64 characters of A-Z, a-z, 0-9, "_" or "-"; got ${JSON.stringify(value)}`);
  }
}

function monthPrefix(now: Date): string {
  return `${now.getUTCFullYear()}/${String(now.getUTCMonth() + 1).padStart(2, "0")}`;
}

/**
 * Key for an uploaded oscilloscope CSV: `captures/<yyyy>/<mm>/<runId>-<uuid>.csv` (UTC month).
 * @param runId server-side id of the capture run
 * @param now time the key is made; defaults to the current time
 * @throws TypeError when runId is not a plain id
 */
export function captureObjectKey(runId: string, now: Date = new Date()): string {
  checkId("runId", runId);
  return `captures/${monthPrefix(now)}/${runId}-${randomUUID()}.csv`;
}

/**
 * Key for a build photo: `photos/<yyyy>/<mm>/<buildId>-<uuid>.<jpg|png|webp>` (UTC month).
 * @param buildId server-side id of the build
 * @param contentType image/jpeg, image/png or image/webp
 * @param now time the key is made; defaults to the current time
 * @throws TypeError when buildId is not a plain id; RangeError for another content type
 */
export function photoObjectKey(buildId: string, contentType = "image/jpeg", now: Date = new Date()): string {
  checkId("buildId", buildId);
  const extension = PHOTO_EXTENSIONS[contentType];
  if (!extension) {
    throw new RangeError(`photo contentType must be one of ${Object.keys(PHOTO_EXTENSIONS).join(", ")}; got ${JSON.stringify(contentType)}`);
  }
  return `photos/${monthPrefix(now)}/${buildId}-${randomUUID()}.${extension}`;
}
