import { apiHandler } from "@/lib/http/api-handler";
import { readJson } from "@/lib/logbook/http";
import { requestUploadSlot } from "@/lib/logbook/uploads";
import { uploadSlotRequestSchema } from "@/lib/validations/run";

export const dynamic = "force-dynamic";

/**
 * A presigned upload slot for a capture (technician and above): `{buildId, filename, sizeBytes, contentType?}` →
 * 201 `{slotId, runId, url, method, headers, expiresAt, maxBytes}`. PUT the file to `url` with `headers`, then
 * POST /api/v1/uploads/{slotId}/complete.
 */
export const POST = apiHandler({ action: "run:upload" }, async (request, _context, user) => {
  const ticket = await requestUploadSlot({ user }, uploadSlotRequestSchema.parse(await readJson(request)));
  const { key: _key, ...body } = ticket;
  return Response.json(body, { status: 201 });
});
