import { apiHandler } from "@/lib/http/api-handler";
import { problem } from "@/lib/http/problem";
import { readJson } from "@/lib/logbook/http";
import { completeUpload } from "@/lib/logbook/uploads";
import { uploadCompleteSchema } from "@/lib/validations/run";

export const dynamic = "force-dynamic";

type Params = { slotId: string };

/**
 * Register the file PUT through a slot as a run (technician and above): `{channel?, probe?, supplyV?,
 * temperatureC?, note?, tweakId?, keepDuplicate?}` → 201 `{id, status}`; 409 with `existingRunId` when the same
 * file is already on the build (the slot stays open: complete it again with keepDuplicate=true).
 */
export const POST = apiHandler<Params>({ action: "run:upload" }, async (request, context, user) => {
  const { slotId } = await context.params;
  const meta = uploadCompleteSchema.parse(await readJson(request));
  const outcome = await completeUpload({ user }, slotId, meta);
  if (outcome.kind === "duplicate") {
    return problem(409, `This file is already logged on this build as run ${outcome.existing.id}; complete again with keepDuplicate=true to keep a second copy.`, {
      type: "duplicate-capture",
      existingRunId: outcome.existing.id,
    });
  }
  return Response.json({ id: outcome.run.id, status: outcome.run.status }, { status: 201, headers: { location: `/api/v1/runs/${outcome.run.id}` } });
});
