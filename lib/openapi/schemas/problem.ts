import { z } from "zod";
import { documented } from "../documented";

// What every /api/v1 error looks like (lib/http/problem.ts writes these).

const problemShape = {
  type: z.url().describe("A URI naming the kind of problem, e.g. https://tankbook.test/problems/not-found."),
  title: z.string().describe("Short words for the status, the same for every problem with that status."),
  status: z.int().min(400).max(599).describe("The HTTP status, repeated in the body."),
  detail: z.string().describe("One plain sentence saying what went wrong with this request."),
};

export const problemSchema = documented(z.object(problemShape), {
  refId: "Problem",
  description: "An RFC 9457 problem (application/problem+json).",
  example: { type: "https://tankbook.test/problems/not-found", title: "Not found", status: 404, detail: "The build was not found." },
});

export const validationProblemSchema = documented(
  z.object({
    ...problemShape,
    fields: z
      .record(z.string(), z.array(z.string()))
      .optional()
      .describe("The failing fields by dotted path (e.g. parts.C1.value), each with its messages."),
  }),
  {
    refId: "ValidationProblem",
    description: "A 400 problem; for input that failed validation, `fields` names each failing field.",
    example: {
      type: "https://tankbook.test/problems/validation",
      title: "Bad request",
      status: 400,
      detail: "name: Give the project a name.",
      fields: { name: ["Give the project a name."] },
    },
  },
);

export const duplicateCaptureProblemSchema = documented(
  z.object({
    ...problemShape,
    existingRunId: z.uuid().describe("The run already logged from the same file (same SHA-256) on this build."),
  }),
  {
    refId: "DuplicateCaptureProblem",
    description: "A 409 for a capture already logged on the build; send keepDuplicate=true to keep a second copy.",
    example: {
      type: "https://tankbook.test/problems/duplicate-capture",
      title: "Conflict",
      status: 409,
      detail: "This file is already logged on this build as run 1b0c…; send keepDuplicate=true to keep a second copy.",
      existingRunId: "1b0c6a2e-8f3e-4a57-9d3c-2f7e6b1c9a40",
    },
  },
);

/** What each error status means across the API; an operation may say more in its own description. */
export const PROBLEM_MEANINGS: Record<number, string> = {
  400: "Bad input: a query, header or body field failed validation (see `fields`), or the body is not JSON.",
  401: "No credentials, or a token or session that is unknown, revoked, expired or belongs to a disabled account.",
  403: "Signed in, but the role is below what this operation needs.",
  404: "Unknown id, or nothing you can see.",
  409: "Conflicts with what is stored (a name already taken, a run already being analysed, a capture already logged).",
  413: "The upload is over the capture limit (UPLOAD_LIMIT_BYTES, 500 MB unless configured).",
  415: "Not a CSV capture, or not the content type this operation takes.",
  429: "More writes than API_WRITES_PER_MINUTE (600 unless configured) by this account in the current minute; wait for the seconds in Retry-After.",
};
