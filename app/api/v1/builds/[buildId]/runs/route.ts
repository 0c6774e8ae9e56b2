import { apiHandler } from "@/lib/http/api-handler";
import { problem } from "@/lib/http/problem";
import { runSummaryJson } from "@/lib/logbook/api-json";
import { checkCaptureSize, uploadLimitBytes } from "@/lib/logbook/capture-files";
import { apiReadHandler, queryObject } from "@/lib/logbook/http";
import { bodyRead, readMultipartCapture } from "@/lib/logbook/multipart";
import { listBuildRunsForRequest, uploadRunFromStream } from "@/lib/logbook/runs";
import { idempotencyKeySchema, runListQuerySchema, runMetadataSchema } from "@/lib/validations/run";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/** A build's runs, newest first: `{items, nextCursor}`; `?verdict=pass|fail|none&status=&from=&to=` (ISO 8601), `?cursor=&limit=` (≤ 200). */
export const GET = apiReadHandler<Params>(async (request, context) => {
  const { buildId } = await context.params;
  const { page } = await listBuildRunsForRequest(request, buildId, () => runListQuerySchema.parse(queryObject(request)));
  return Response.json({ items: page.items.map(runSummaryJson), nextCursor: page.nextCursor });
});

/**
 * Upload a capture (technician and above): multipart/form-data with the CSV in `file` and the fields `channel`,
 * `probe`, `supplyV`, `temperatureC`, `note`, `tweakId`, `keepDuplicate`. The file streams to object storage as it
 * arrives. 201 `{id, status}` with Location; a retry with the same Idempotency-Key answers 200 with the first run;
 * the same file already on the build answers 409 with `existingRunId` (send keepDuplicate=true to keep a copy).
 */
export const POST = apiHandler<Params>({ action: "run:upload" }, async (request, context, user) => {
  const { buildId } = await context.params;
  const length = Number(request.headers.get("content-length"));
  // The multipart envelope adds a little; anything far past the limit is refused before a byte is read.
  if (Number.isFinite(length)) checkCaptureSize(Math.max(0, length - 64 * 1024), uploadLimitBytes());
  const rawKey = request.headers.get("idempotency-key");
  const idempotencyKey = rawKey === null ? undefined : idempotencyKeySchema.parse(rawKey);
  const parts = readMultipartCapture(request);
  const file = await parts.file;
  const meta = parts.fields.then((fields) => runMetadataSchema.parse(fields));
  meta.catch(() => undefined);
  const outcome = await uploadRunFromStream(
    { user },
    { buildId, filename: file.filename, contentType: file.mimeType, stream: file.stream, meta, idempotencyKey },
  ).catch(async (err: unknown) => {
    await bodyRead(parts);
    throw err;
  });
  if (outcome.kind === "duplicate") {
    const existing = outcome.existing;
    return problem(
      409,
      `This file is already logged on this build as run ${existing.id} (${existing.originalFilename}); send keepDuplicate=true to keep a second copy.`,
      { type: "duplicate-capture", existingRunId: existing.id },
      { location: `/api/v1/runs/${existing.id}` },
    );
  }
  const run = outcome.run;
  const headers: Record<string, string> = { location: `/api/v1/runs/${run.id}` };
  if (outcome.kind === "existing") headers["idempotent-replayed"] = "true";
  return Response.json({ id: run.id, status: run.status }, { status: outcome.kind === "existing" ? 200 : 201, headers });
});
