import type { OpenAPIRegistry, ResponseConfig, RouteConfig } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { roleNeededFor, type Action } from "@/lib/auth/permissions";
import { idSchema } from "@/lib/validations/common";
import { documented } from "./documented";
import { duplicateCaptureProblemSchema, PROBLEM_MEANINGS, problemSchema, validationProblemSchema } from "./schemas/problem";

/** The resource groups of the document, in the order the API page shows them. */
export const TAGS = [
  { name: "Account", description: "Who you are, and signing in without a browser form." },
  { name: "Projects", description: "A project groups the designs of one product or experiment." },
  { name: "Designs", description: "A design: topology, parts with tolerances, spec; every edit is a new revision." },
  { name: "Builds", description: "A physical prototype of a design, its as-built values and its tweak log." },
  { name: "Runs", description: "One oscilloscope capture of a build, its analysis, prediction, drift and verdict." },
  { name: "Uploads", description: "Presigned uploads straight to object storage (what the browser uses); scripts can use the multipart POST instead." },
  { name: "Reviews", description: "Accepting or rejecting builds, flags, follows, exports." },
  { name: "Meta", description: "This document." },
] as const;
export type Tag = (typeof TAGS)[number]["name"];

export const SECURITY_SCHEMES = {
  bearerToken: {
    type: "http",
    scheme: "bearer",
    bearerFormat: "tbk_…",
    description: "An API token (tbk_ followed by 43 characters), made on the profile page or with `npm run -s create-token -- --email EMAIL`.",
  },
  sessionCookie: {
    type: "apiKey",
    in: "cookie",
    name: "tankbook_session",
    description: "The browser session cookie set by signing in. Writes with it must come from Tankbook's own origin.",
  },
} as const;

export type ProblemStatus = 400 | 401 | 403 | 404 | 409 | 413 | 415 | 422 | 429;

/** What an error status means for one operation: a sentence, or a sentence and a body richer than Problem. */
export type ProblemNote = string | { description: string; schema: z.ZodType };

/** The 409 of a capture upload: the body names the run already logged from the same file. */
export const duplicateCapture = (description: string): ProblemNote => ({ description, schema: duplicateCaptureProblemSchema });

/** The extension that carries the lowest role an operation needs ("public" for none). */
export const ROLE_EXTENSION = "x-tankbook-minimum-role";

export interface OperationSpec {
  method: "get" | "post" | "put" | "patch" | "delete";
  /** OpenAPI form with the /api/v1 prefix: /api/v1/runs/{runId}. */
  path: string;
  operationId: string;
  tag: Tag;
  summary: string;
  description?: string;
  /** The permission the handler checks through apiHandler; null for a public route. */
  action: Action | null;
  params?: z.ZodObject;
  query?: z.ZodObject;
  headers?: z.ZodObject;
  body?: NonNullable<RouteConfig["request"]>["body"];
  responses: Record<number, ResponseConfig>;
  /** Error statuses beyond those implied by auth, path ids and input, each with what it means here. */
  problems?: Partial<Record<ProblemStatus, ProblemNote>>;
  /** Session-cookie only (e.g. signing out), so no bearer token. */
  cookieOnly?: boolean;
}

const roleWords = (action: Action) => {
  const role = roleNeededFor(action);
  return role === "viewer" ? "any signed-in role" : `the ${role} role or above`;
};

/**
 * A path parameter holding a row id: the same rule (lib/validations idSchema) the services apply.
 * @param what - the row's kind for the description, e.g. "build"
 */
export function pathId(what: string) {
  return documented(idSchema, { description: `The ${what}'s id (a UUID).`, example: "3f2b8c1e-5d4a-4e6b-9a7c-1d2e3f4a5b6c" });
}

function problemResponse(status: ProblemStatus, note: ProblemNote | undefined): ResponseConfig {
  const fallback = status === 400 ? validationProblemSchema : problemSchema;
  const schema = typeof note === "object" ? note.schema : fallback;
  const headers = status === 429 ? z.object({ "Retry-After": z.string().describe("Seconds to wait before trying again.") }) : undefined;
  return {
    description: (typeof note === "object" ? note.description : note) ?? PROBLEM_MEANINGS[status],
    content: { "application/problem+json": { schema } },
    ...(headers ? { headers } : {}),
  };
}

/**
 * Registers one /api/v1 operation: security from `action` (token or cookie; none when public), the lowest role as
 * an extension, and problem+json responses for 401 (authenticated routes), 403 (routes above viewer), 404 (ids in
 * the path), 400 (any input) and the statuses the spec adds.
 */
export function registerOperation(registry: OpenAPIRegistry, spec: OperationSpec): void {
  const implied: Partial<Record<ProblemStatus, ProblemNote | undefined>> = {};
  if (spec.params || spec.query || spec.body || spec.headers) implied[400] = undefined;
  if (spec.action) implied[401] = undefined;
  if (spec.action && roleNeededFor(spec.action) !== "viewer") implied[403] = `Needs ${roleWords(spec.action)}.`;
  if (spec.path.includes("{")) implied[404] = undefined;
  // lib/http/api-handler.ts counts every authenticated write (API_WRITES_PER_MINUTE per account).
  if (spec.action && spec.method !== "get") implied[429] = undefined;
  const problems = { ...implied, ...spec.problems };
  const responses: Record<number, ResponseConfig> = { ...spec.responses };
  for (const status of Object.keys(problems).map(Number).sort() as ProblemStatus[]) {
    responses[status] = problemResponse(status, problems[status]);
  }
  const who = spec.action ? `Needs ${roleWords(spec.action)}.` : "Public: no credentials needed.";
  registry.registerPath({
    method: spec.method,
    path: spec.path,
    operationId: spec.operationId,
    tags: [spec.tag],
    summary: spec.summary,
    description: [spec.description, who].filter(Boolean).join("\n\n"),
    security: spec.action === null ? [] : spec.cookieOnly ? [{ sessionCookie: [] }] : [{ bearerToken: [] }, { sessionCookie: [] }],
    [ROLE_EXTENSION]: spec.action ? roleNeededFor(spec.action) : "public",
    request: {
      ...(spec.params ? { params: spec.params } : {}),
      ...(spec.query ? { query: spec.query } : {}),
      ...(spec.headers ? { headers: spec.headers } : {}),
      ...(spec.body ? { body: spec.body } : {}),
    },
    responses,
  });
}

/** A JSON request body from a lib/validations schema, under its component name. */
export function jsonBody(
  schema: z.ZodType,
  refId: string,
  options: { required?: boolean; example?: unknown } = {},
): NonNullable<RouteConfig["request"]>["body"] {
  return {
    required: options.required ?? true,
    content: { "application/json": { schema: documented(schema, { refId }), ...(options.example !== undefined ? { example: options.example } : {}) } },
  };
}

/** A JSON response. */
export function jsonResponse(schema: z.ZodType, description: string, headers?: z.ZodObject): ResponseConfig {
  return { description, content: { "application/json": { schema } }, ...(headers ? { headers } : {}) };
}

export const locationHeader = (what: string) => z.object({ Location: z.string().describe(`Path of ${what}.`) });
