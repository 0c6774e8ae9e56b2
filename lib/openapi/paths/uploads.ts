import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { uploadCompleteSchema, uploadSlotRequestSchema } from "@/lib/validations/run";
import { documented } from "../documented";
import { REQUEST_EXAMPLES } from "../examples";
import { duplicateCapture, jsonBody, jsonResponse, locationHeader, pathId, registerOperation } from "../operation";
import { isoTime, rowId } from "../schemas/common";
import { runAcceptedSchema } from "../schemas/run";

const uploadSlotSchema = documented(
  z.object({
    slotId: rowId,
    runId: rowId.describe("The id the run will have once the upload is completed."),
    url: z.url().describe("Presigned URL to PUT the file to."),
    method: z.literal("PUT"),
    headers: z.record(z.string(), z.string()).describe("Headers the PUT must carry (the URL is signed for them)."),
    expiresAt: isoTime,
    maxBytes: z.int().describe("The capture limit, bytes."),
  }),
  { refId: "UploadSlot" },
);

export function registerUploadPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/uploads",
    operationId: "requestUploadSlot",
    tag: "Uploads",
    summary: "Ask for a presigned upload",
    description: "Step 1 of 2: PUT the file to `url` with `headers` (straight to object storage), then complete the upload.",
    action: "run:upload",
    body: jsonBody(uploadSlotRequestSchema, "UploadSlotRequest", { example: REQUEST_EXAMPLES.requestUploadSlot }),
    responses: { 201: jsonResponse(uploadSlotSchema, "The slot.") },
    problems: {
      404: "The build does not exist.",
      413: "sizeBytes is over the capture limit (UPLOAD_LIMIT_BYTES).",
      415: "The file name or content type is not a CSV capture's.",
    },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/uploads/{slotId}/complete",
    operationId: "completeUpload",
    tag: "Uploads",
    summary: "Register an uploaded capture as a run",
    description: "Step 2 of 2: checks the stored object and records the run (same fields as the multipart upload).",
    action: "run:upload",
    params: z.object({ slotId: pathId("upload slot") }),
    body: jsonBody(uploadCompleteSchema, "UploadComplete", { example: REQUEST_EXAMPLES.completeUpload }),
    responses: { 201: jsonResponse(runAcceptedSchema, "The run created and queued for analysis.", locationHeader("the run")) },
    problems: {
      400: "A field failed validation, the slot expired, or the file has not arrived in storage.",
      409: duplicateCapture("The same file is already logged on this build (`existingRunId`); the slot stays open: complete it again with keepDuplicate=true."),
    },
  });
}
