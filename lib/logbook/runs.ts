import { randomUUID } from "node:crypto";
import { Transform, Writable, type Readable } from "node:stream";
import { pipeline } from "node:stream/promises";
import { db } from "@/db/index";
import { getBuild, getBuildForUpdate } from "@/db/queries/builds";
import { getDesign } from "@/db/queries/designs";
import * as q from "@/db/queries/runs";
import { getTweak } from "@/db/queries/tweaks";
import { getIdempotentRunId, markUploadSlotCompleted, saveIdempotencyKey } from "@/db/queries/uploads";
import { authenticateRequest, authenticateRequestWith } from "@/lib/auth/authenticate-request";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { AppError, BadRequestError, ConflictError, NotFoundError, PayloadTooLargeError } from "@/lib/errors";
import { enqueueAnalysis } from "@/lib/jobs/queue";
import { analyseDrift, type DriftAnalysis } from "@/lib/oscillator";
import { captureObjectKey, deleteObject, headObject, presignGet, putObject } from "@/lib/storage";
import type { RunMetadata } from "@/lib/validations/run";
import { checkCaptureFile, checkCaptureSize, formatBytes, meterStream, sha256OfObject, uploadLimitBytes } from "./capture-files";
import { refuseUnreadableCapture, refuseUnreadableStart } from "./capture-precheck";
import { SNIFF_BYTES } from "@/lib/capture-sniff/sniff-header";
import { audit, isId, type Actor } from "./context";
import { oscillatorDesign, runSnapshot } from "./prediction";

/**
 * What registering a capture did: a new run, the run already logged from the same file on this build, or
 * (`existing`) the run an earlier request with the same Idempotency-Key created.
 */
export type RegisterOutcome = { kind: "created"; run: q.Run } | { kind: "duplicate"; existing: q.Run } | { kind: "existing"; run: q.Run };

export interface RegisterRunInput {
  /** The run's id, chosen by the server when the object key was made. */
  runId: string;
  buildId: string;
  objectKey: string;
  /** As the user named it; shown only, never used as a key. */
  originalFilename: string;
  /** The size the upload announced; the stored object must match it. */
  expectedSizeBytes?: number;
  /** Already computed while streaming (API upload); otherwise computed here by streaming the object. */
  sha256?: string;
  /**
   * What the streamed upload itself stored: its size and first bytes. Storage then needs no HEAD and no read-back
   * for the size and readability checks (a presigned upload has neither, so those go to storage).
   */
  stored?: { sizeBytes: number; start: Uint8Array };
  meta: RunMetadata;
  /** Idempotency-Key of the API request, saved with the run in one transaction. */
  idempotencyKey?: string;
  /** Upload slot to mark completed with the run. */
  slotId?: string;
  /** Back-dated time for the demo seed. */
  createdAt?: Date;
}

class IdempotencyRace extends Error {}

/**
 * Whether a retry under an Idempotency-Key asks for the same thing as the request that claimed it: same build,
 * same file bytes and the same details. A key reused for another request is refused with 422, as the IETF
 * draft "The Idempotency-Key HTTP Header Field" (draft-ietf-httpapi-idempotency-key-header, §2.7) advises,
 * instead of silently answering with a run the client did not send.
 * @throws AppError 422 when the request differs
 */
function assertSameRequest(first: q.Run, request: { buildId: string; sha256: string; meta: RunMetadata }): void {
  const { meta } = request;
  const same =
    first.buildId === request.buildId &&
    first.sha256 === request.sha256 &&
    (first.channel ?? null) === (meta.channel ?? null) &&
    first.probeAttenuation === meta.probe &&
    first.supplyV === (meta.supplyV ?? null) &&
    first.temperatureC === (meta.temperatureC ?? null) &&
    first.note === meta.note &&
    (first.tweakId ?? null) === (meta.tweakId ?? null);
  if (!same) {
    throw new AppError(
      `This Idempotency-Key was already used for another upload (run ${first.id}); send a new key for a different file or different details.`,
      422,
      "idempotency-key-reused",
      { "idempotency-key": ["used for a different request"] },
    );
  }
}

/** The run a user's earlier request with this Idempotency-Key created, if it is still there. */
async function idempotentRun(userId: string, idempotencyKey: string): Promise<q.Run | null> {
  const firstId = await getIdempotentRunId(userId, idempotencyKey);
  return firstId ? q.getRun(firstId) : null;
}

/**
 * Records a capture already in storage as a run of a build, and queues its analysis (technician and above).
 * Checks the object exists and its size, computes its SHA-256 by streaming it, and — in the one transaction that
 * inserts the run — snapshots the build's as-built values with the predicted frequency, bands and spec, and
 * inserts the analysis job. A file already logged on the build comes back as a duplicate unless
 * `meta.keepDuplicate` asks for a second copy.
 * @throws NotFoundError; BadRequestError (object missing, size mismatch, empty, bad tweak); PayloadTooLargeError
 */
export async function registerRun(actor: Actor, input: RegisterRunInput): Promise<RegisterOutcome> {
  const user = requirePermission(actor.user, "run:upload");
  const build = isId(input.buildId) ? await getBuild(input.buildId) : null;
  if (!build) throw new NotFoundError("The build");
  const info = input.stored ? { sizeBytes: input.stored.sizeBytes } : await headObject(input.objectKey);
  if (!info) throw new BadRequestError("The file has not arrived in storage yet: upload it first, then register it.", { file: ["not uploaded"] });
  if (info.sizeBytes > uploadLimitBytes()) {
    await deleteObject(input.objectKey);
    checkCaptureSize(info.sizeBytes);
  }
  if (input.expectedSizeBytes !== undefined && info.sizeBytes !== input.expectedSizeBytes) {
    throw new BadRequestError(`The stored file is ${formatBytes(info.sizeBytes)}, not the ${formatBytes(input.expectedSizeBytes)} announced; upload it again.`, {
      file: ["size mismatch"],
    });
  }
  if (info.sizeBytes === 0) throw new BadRequestError("The file is empty.", { file: ["empty"] });
  if (input.stored) await refuseUnreadableStart(input.objectKey, input.stored.start, info.sizeBytes);
  else await refuseUnreadableCapture(input.objectKey, info.sizeBytes);
  const sha256 = input.sha256 ?? (await sha256OfObject(input.objectKey));

  try {
    return await db().transaction(async (trx): Promise<RegisterOutcome> => {
      // Locking the build serialises uploads to it (the duplicate check holds) and freezes its parts for the snapshot.
      const locked = await getBuildForUpdate(input.buildId, trx);
      if (!locked) throw new NotFoundError("The build");
      const already = await q.getRun(input.runId, trx);
      if (already) return { kind: "created", run: already };
      // The key is looked at before the duplicate check: concurrent retries with one key queue on the build lock
      // above, and each one after the first finds the key claimed and replays its run instead of being a 409.
      if (input.idempotencyKey) {
        const firstId = await getIdempotentRunId(user.id, input.idempotencyKey, trx);
        const first = firstId ? await q.getRun(firstId, trx) : null;
        if (first) {
          assertSameRequest(first, { buildId: locked.id, sha256, meta: input.meta });
          return { kind: "existing", run: first };
        }
      }
      const design = await getDesign(locked.designId, trx);
      if (!design) throw new NotFoundError("The design");
      if (input.meta.tweakId) {
        const tweak = await getTweak(input.meta.tweakId, trx);
        if (!tweak || tweak.buildId !== locked.id) throw new BadRequestError("That tweak is not one of this build's.", { tweakId: ["not a tweak of this build"] });
      }
      const existing = await q.findDuplicateRun(locked.id, sha256, trx);
      if (existing && !input.meta.keepDuplicate) return { kind: "duplicate", existing };

      const run = await q.createRun(
        {
          id: input.runId,
          buildId: locked.id,
          designRevisionId: design.revision.id,
          tweakId: input.meta.tweakId ?? null,
          objectKey: input.objectKey,
          sha256,
          sizeBytes: info.sizeBytes,
          originalFilename: input.originalFilename,
          channel: input.meta.channel ?? null,
          probeAttenuation: input.meta.probe,
          supplyV: input.meta.supplyV ?? null,
          temperatureC: input.meta.temperatureC ?? null,
          note: input.meta.note,
          snapshot: runSnapshot(locked, design),
          duplicateOfRunId: existing?.id ?? null,
          createdBy: user.id,
          createdAt: input.createdAt,
        },
        trx,
      );
      if (input.idempotencyKey && !(await saveIdempotencyKey(user.id, input.idempotencyKey, run.id, trx))) throw new IdempotencyRace();
      if (input.slotId) await markUploadSlotCompleted(input.slotId, trx);
      await enqueueAnalysis(run.id, trx);
      await audit(
        { ...actor, user },
        "run.uploaded",
        { type: "run", id: run.id },
        { buildId: locked.id, filename: input.originalFilename, sizeBytes: info.sizeBytes, sha256, duplicateOf: existing?.id ?? null },
        trx,
      );
      return { kind: "created", run };
    });
  } catch (err) {
    if (err instanceof IdempotencyRace && input.idempotencyKey) {
      const first = await idempotentRun(user.id, input.idempotencyKey);
      if (first) {
        assertSameRequest(first, { buildId: input.buildId, sha256, meta: input.meta });
        return { kind: "existing", run: first };
      }
    }
    throw err;
  }
}

/** A pass-through that keeps a copy of the first `limitBytes` it passes on. */
function keepStart(limitBytes: number): { stream: Transform; bytes(): Uint8Array } {
  const chunks: Buffer[] = [];
  let kept = 0;
  const stream = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      if (kept < limitBytes) {
        const part = chunk.subarray(0, limitBytes - kept);
        chunks.push(Buffer.from(part));
        kept += part.length;
      }
      done(null, chunk);
    },
  });
  return { stream, bytes: () => new Uint8Array(Buffer.concat(chunks)) };
}

export interface StreamUploadInput {
  buildId: string;
  filename: string;
  contentType: string | null;
  stream: Readable;
  /** May still be arriving (multipart fields after the file); awaited once the file is stored. */
  meta: RunMetadata | Promise<RunMetadata>;
  idempotencyKey?: string;
}

/** What a streamed upload did; `existing` is a retry answered with the first request's run. */
export type StreamUploadOutcome = RegisterOutcome;

/**
 * The API's multipart path: streams the file to storage (multipart, 8 MiB parts) while hashing and counting it,
 * so the file never sits in memory, then registers it like a presigned upload. A retry with the same
 * Idempotency-Key returns the first run; a duplicate's object is removed again.
 * @throws PayloadTooLargeError past UPLOAD_LIMIT_BYTES; UnsupportedMediaTypeError for a non-CSV; NotFoundError
 */
export async function uploadRunFromStream(actor: Actor, input: StreamUploadInput): Promise<StreamUploadOutcome> {
  let user: CurrentUser;
  let buildId: string;
  try {
    user = requirePermission(actor.user, "run:upload");
    const build = isId(input.buildId) ? await getBuild(input.buildId) : null;
    if (!build) throw new NotFoundError("The build");
    buildId = build.id;
    checkCaptureFile(input.filename, input.contentType);
    if (input.idempotencyKey) {
      const first = await idempotentRun(user.id, input.idempotencyKey);
      if (first) {
        // A retry is hashed but not stored again, so a key reused for another file is still told apart.
        const metered = meterStream(input.stream, uploadLimitBytes());
        await pipeline(metered.stream, new Writable({ write: (_chunk, _enc, done) => done() }));
        assertSameRequest(first, { buildId: build.id, sha256: metered.result().sha256, meta: await input.meta });
        return { kind: "existing", run: first };
      }
    }
  } catch (err) {
    // Drain what is left of the body so the client sees the answer instead of a stalled upload.
    input.stream.resume();
    throw err;
  }
  const runId = randomUUID();
  const key = captureObjectKey(runId);
  const metered = meterStream(input.stream, uploadLimitBytes());
  const start = keepStart(SNIFF_BYTES);
  metered.stream.on("error", (err) => start.stream.destroy(err));
  try {
    await putObject(key, metered.stream.pipe(start.stream), "text/csv");
  } catch (err) {
    input.stream.resume();
    await deleteObject(key).catch(() => undefined);
    if (metered.tooLarge()) throw new PayloadTooLargeError(`The file is over the ${formatBytes(uploadLimitBytes())} capture limit.`);
    // A body that broke off mid-file is the client's fault (a 400 kept on the stream), not storage's.
    if (input.stream.errored instanceof AppError) throw input.stream.errored;
    throw err;
  }
  const { sha256, sizeBytes } = metered.result();
  let outcome: RegisterOutcome;
  try {
    outcome = await registerRun(actor, {
      runId,
      buildId,
      objectKey: key,
      originalFilename: input.filename,
      expectedSizeBytes: sizeBytes,
      sha256,
      stored: { sizeBytes, start: start.bytes() },
      meta: await input.meta,
      idempotencyKey: input.idempotencyKey,
    });
  } catch (err) {
    await deleteObject(key).catch(() => undefined);
    throw err;
  }
  if (outcome.kind === "duplicate" || outcome.run.id !== runId) await deleteObject(key).catch(() => undefined);
  return outcome;
}

/**
 * Queues a finished run for analysis again, e.g. after the engine improved (technician and above).
 * @throws NotFoundError; ConflictError while it is queued or running
 */
export async function reanalyseRun(actor: Actor, runId: string): Promise<q.Run> {
  const user = requirePermission(actor.user, "run:reanalyse");
  const run = isId(runId) ? await q.getRun(runId) : null;
  if (!run) throw new NotFoundError("The run");
  const busy = () => new ConflictError("This run is being analysed already; its result will replace the current one.");
  if (run.status === "queued" || run.status === "running") throw busy();
  // A re-analysis judges the run by the design's spec as it is now (an engineer may have changed it since);
  // the as-built values and the prediction it is compared with stay as they were at upload.
  const design = await getDesign(run.snapshot.designId);
  const judgeAgainst = design ? { spec: design.revision.spec, revision: design.revision.revision } : undefined;
  return db().transaction(async (trx) => {
    if (!(await q.resetRunForAnalysis(runId, trx, judgeAgainst))) throw busy();
    await enqueueAnalysis(runId, trx);
    await audit(
      { ...actor, user },
      "run.reanalysis-requested",
      { type: "run", id: runId },
      {
        previousStatus: run.status,
        previousEngineVersion: run.engineVersion,
        specRevision: judgeAgainst?.revision ?? run.snapshot.specRevision ?? run.snapshot.designRevision,
      },
      trx,
    );
    return (await q.getRun(runId, trx))!;
  });
}

/** @throws NotFoundError */
export async function getRun(user: CurrentUser | null, runId: string): Promise<q.Run> {
  requirePermission(user, "read");
  const run = isId(runId) ? await q.getRun(runId) : null;
  if (!run) throw new NotFoundError("The run");
  return run;
}

/** Measured against predicted, from the run's own snapshot; null until the run is analysed or without a prediction. */
export function runDrift(run: q.Run): DriftAnalysis | null {
  if (run.measuredHz === null || run.snapshot.predictedHz === null) return null;
  try {
    const s = run.snapshot;
    return analyseDrift(oscillatorDesign(s.topology, s.parts, s.extraCapacitanceF, s.windings), run.measuredHz);
  } catch {
    return null;
  }
}

/**
 * The run page: the run (snapshot and results), its build and design names, the tweak it follows, its flags,
 * every spec check, and the drift explained from the snapshot.
 */
export async function getRunView(user: CurrentUser | null, runId: string) {
  requirePermission(user, "read");
  const found = isId(runId) ? await q.getRunWithContext(runId) : null;
  if (!found) throw new NotFoundError("The run");
  return runView(found);
}

function runView({ run, build, flags, tweak }: q.RunWithContext) {
  return { run, build, flags, tweak, checks: run.specChecks ?? [], drift: runDrift(run) };
}

/**
 * Who asks and the run they ask for (for an API request), read in the statement that looks up their API token
 * (authenticateRequestWith); the permission check comes before anything read is used.
 * @throws UnauthorizedError, ForbiddenError, NotFoundError
 */
export async function getRunViewForRequest(request: Request, runId: string) {
  const { user, data } = isId(runId) ? await authenticateRequestWith(request, q.runWithContextRead(runId)) : { user: await authenticateRequest(request), data: null };
  const allowed = requirePermission(user, "read");
  if (!data) throw new NotFoundError("The run");
  return { user: allowed, view: runView(data) };
}

/** A build's runs, newest first, filtered (for the API and the build page's table). */
export async function listBuildRuns(user: CurrentUser | null, buildId: string, filter: q.RunFilter = {}) {
  requirePermission(user, "read");
  if (!isId(buildId)) throw new NotFoundError("The build");
  const page = await q.listRuns(buildId, filter);
  // A page with runs on it proves the build exists; only an empty page needs the second query.
  if (page.items.length === 0 && !(await getBuild(buildId))) throw new NotFoundError("The build");
  return page;
}

/**
 * {@link listBuildRuns} for an API request: the caller's token lookup, the page and whether the build exists in
 * one statement.
 * @param readFilter - parses the query string; when it throws, the caller is still checked first, so an anonymous
 *                     request with a bad query string stays a 401 and a signed-in one gets the 400
 * @throws UnauthorizedError, ForbiddenError, NotFoundError, and what readFilter throws
 */
export async function listBuildRunsForRequest(request: Request, buildId: string, readFilter: () => q.RunFilter) {
  let filter: q.RunFilter;
  try {
    filter = readFilter();
  } catch (err) {
    requirePermission(await authenticateRequest(request), "read");
    throw err;
  }
  const { user, data } = isId(buildId) ? await authenticateRequestWith(request, q.runsListRead(buildId, filter)) : { user: await authenticateRequest(request), data: null };
  const allowed = requirePermission(user, "read");
  if (!data || (data.page.items.length === 0 && !data.buildExists)) throw new NotFoundError("The build");
  return { user: allowed, page: data.page };
}

/** The plot data of an analysed run (waveform envelope, spectrum in dBV, harmonic markers); null until done. */
export async function getRunPlot(user: CurrentUser | null, runId: string): Promise<{ status: q.RunStatus; plot: unknown | null; specLimitDbc: number | null }> {
  const run = await getRun(user, runId);
  const plot = run.status === "done" ? await q.getRunPlot(runId) : null;
  return { status: run.status, plot, specLimitDbc: run.snapshot.spec?.maxHarmonicDbc ?? null };
}

/** A short-lived link that downloads the raw capture under its original name. */
export async function getRunCaptureUrl(user: CurrentUser | null, runId: string): Promise<string> {
  const run = await getRun(user, runId);
  return presignGet(run.objectKey, { filename: run.originalFilename, expiresInSeconds: 300 });
}
