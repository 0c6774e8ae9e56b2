import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { compileErrors, validate } from "@readme/openapi-parser";
import request from "supertest";
import { describe, expect, it } from "vitest";
import { z } from "zod";
import { buildOpenApiDocument, ROLE_EXTENSION } from "@/lib/openapi";
import { REQUEST_EXAMPLES, type ExampleOperation } from "@/lib/openapi/examples";
import { runWithdrawalInputSchema } from "@/lib/validations/run-withdrawal";
import { timebaseInputSchema } from "@/lib/validations/timebase";
import { signInSchema } from "@/lib/validations/auth";
import { buildInputSchema } from "@/lib/validations/build";
import { designInputSchema, designPatchSchemaFor } from "@/lib/validations/design";
import { projectInputSchema, projectPatchSchema } from "@/lib/validations/project";
import { buildReviewInputSchema, retunePlanSchema } from "@/lib/validations/review";
import { runMetadataSchema, uploadCompleteSchema, uploadSlotRequestSchema } from "@/lib/validations/run";
import { tweakInputSchemaFor } from "@/lib/validations/tweak";
import { appUrl } from "./helpers";

const root = path.resolve(import.meta.dirname, "../../..");
const apiDir = path.join(root, "app/api/v1");
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE"] as const;

/** Every route file under app/api/v1 as "METHOD /api/v1/path/{param}", from the methods it exports. */
function routeOperations(): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const entry of readdirSync(dir, { withFileTypes: true })) {
      const full = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(full);
      else if (entry.name === "route.ts") {
        const urlPath = "/api/v1/" + path.relative(apiDir, dir).split(path.sep).join("/");
        const openApiPath = urlPath.replace(/\[(\w+)\]/g, "{$1}").replace(/\/$/, "");
        const source = readFileSync(full, "utf8");
        for (const method of METHODS) {
          if (new RegExp(`export\\s+(const\\s+${method}\\b|(async\\s+)?function\\s+${method}\\b)`).test(source)) found.push(`${method} ${openApiPath}`);
        }
      }
    }
  };
  walk(apiDir);
  return found.sort();
}

function documentOperations(doc: ReturnType<typeof buildOpenApiDocument>["document"]): string[] {
  return Object.entries(doc.paths)
    .flatMap(([p, item]) => Object.keys(item).map((m) => `${m.toUpperCase()} ${p}`))
    .sort();
}

/** The handler's own schema for each example body (the document shows these examples). */
const EXAMPLE_SCHEMAS: Record<ExampleOperation, z.ZodType> = {
  createSession: signInSchema,
  createProject: projectInputSchema,
  updateProject: projectPatchSchema,
  createDesign: designInputSchema,
  reviseDesign: designPatchSchemaFor("colpitts"),
  createBuild: buildInputSchema,
  logTweak: tweakInputSchemaFor("colpitts"),
  requestUploadSlot: uploadSlotRequestSchema,
  completeUpload: uploadCompleteSchema,
  reviewBuild: buildReviewInputSchema,
  planRetune: retunePlanSchema.pick({ series: true }),
  setBuildTimebase: timebaseInputSchema,
  withdrawRun: runWithdrawalInputSchema,
};

/** Request components and the lib/validations schema each one is generated from. */
const REQUEST_COMPONENTS: Record<string, z.ZodType> = {
  SignIn: signInSchema,
  ProjectInput: projectInputSchema,
  ProjectPatch: projectPatchSchema,
  DesignInput: designInputSchema,
  DesignPatch: designPatchSchemaFor("colpitts"),
  BuildInput: buildInputSchema,
  TweakInput: tweakInputSchemaFor("colpitts"),
  UploadSlotRequest: uploadSlotRequestSchema,
  UploadComplete: uploadCompleteSchema,
  BuildReviewInput: buildReviewInputSchema,
  RunUpload: runMetadataSchema,
  TimebaseInput: timebaseInputSchema,
  RunWithdrawalInput: runWithdrawalInputSchema,
};

describe("buildOpenApiDocument", () => {
  const { document, stale } = buildOpenApiDocument();

  it("validates as OpenAPI 3.1 with a general-purpose validator", async () => {
    expect(document.openapi).toBe("3.1.0");
    const result = await validate(structuredClone(document) as never);
    expect(result.valid, result.valid ? "" : compileErrors(result)).toBe(true);
  });

  it("is refused by the same validator once broken, so the check above has teeth", async () => {
    const danglingRef = structuredClone(document) as typeof document;
    const me = danglingRef.paths["/api/v1/me"].get as { responses: Record<string, { content: Record<string, { schema: unknown }> }> };
    me.responses["200"].content["application/json"].schema = { $ref: "#/components/schemas/Nobody" };
    expect((await validate(danglingRef as never)).valid).toBe(false);
    const twiceNamed = structuredClone(document) as typeof document;
    (twiceNamed.paths["/api/v1/projects"].post as { operationId: string }).operationId = "listProjects";
    expect((await validate(twiceNamed as never)).valid).toBe(false);
  });

  it("describes exactly the routes app/api/v1 exports, method by method", () => {
    const routes = routeOperations();
    const documented = documentOperations(document);
    expect(routes.length).toBeGreaterThan(20);
    expect(documented.filter((op) => !routes.includes(op)), "in the document but no route exports it").toEqual([]);
    expect(routes.filter((op) => !documented.includes(op)), "exported by a route but not in the document").toEqual([]);
  });

  it("has unique operation ids, a tag, a minimum role and problem+json errors on every operation", () => {
    const ids = new Set<string>();
    for (const [p, item] of Object.entries(document.paths)) {
      for (const [method, op] of Object.entries(item) as [string, Record<string, unknown>][]) {
        const where = `${method} ${p}`;
        expect(ids.has(op.operationId as string), where).toBe(false);
        ids.add(op.operationId as string);
        expect((op.tags as string[])?.length, where).toBe(1);
        expect(["public", "viewer", "technician", "engineer", "admin"], where).toContain(op[ROLE_EXTENSION]);
        const responses = op.responses as Record<string, { content?: Record<string, unknown> }>;
        for (const [status, response] of Object.entries(responses)) {
          if (Number(status) >= 400) expect(Object.keys(response.content ?? {}), `${where} ${status}`).toEqual(["application/problem+json"]);
        }
        if (op[ROLE_EXTENSION] !== "public") expect(Object.keys(responses), where).toContain("401");
        if (p.includes("{")) expect(Object.keys(responses), where).toContain("404");
      }
    }
  });

  it("lists the error statuses on the capture upload (422 for a reused Idempotency-Key with another body), with the duplicate's existingRunId", () => {
    const upload = document.paths["/api/v1/builds/{buildId}/runs"].post as { responses: Record<string, { content?: Record<string, { schema: { $ref?: string } }> }> };
    expect(Object.keys(upload.responses).sort()).toEqual(["200", "201", "400", "401", "403", "404", "409", "413", "415", "422", "429"]);
    expect(upload.responses["409"].content!["application/problem+json"].schema.$ref).toBe("#/components/schemas/DuplicateCaptureProblem");
    expect(Object.keys(document.components.securitySchemes)).toEqual(["bearerToken", "sessionCookie"]);
  });

  it("takes every request body's fields from the handler's lib/validations schema", () => {
    const schemas = document.components.schemas as Record<string, { properties: Record<string, unknown>; required?: string[] }>;
    for (const [component, schema] of Object.entries(REQUEST_COMPONENTS)) {
      // zod's own JSON Schema conversion, independent of zod-to-openapi, says which fields the schema accepts.
      const own = z.toJSONSchema(schema, { io: "input", unrepresentable: "any" }) as { properties: Record<string, unknown>; required?: string[] };
      const expected = Object.keys(own.properties).concat(component === "RunUpload" ? ["file"] : []).sort();
      expect(Object.keys(schemas[component].properties).sort(), component).toEqual(expected);
      const required = (own.required ?? []).concat(component === "RunUpload" ? ["file"] : []).sort();
      expect((schemas[component].required ?? []).slice().sort(), `${component} required`).toEqual(required);
    }
  });

  it("shows examples that the handlers' own schemas accept", () => {
    for (const [operation, example] of Object.entries(REQUEST_EXAMPLES) as [ExampleOperation, unknown][]) {
      const parsed = EXAMPLE_SCHEMAS[operation].safeParse(example);
      expect(parsed.success, `${operation}: ${parsed.success ? "" : JSON.stringify(parsed.error.issues)}`).toBe(true);
    }
    const shown = Object.values(document.paths)
      .flatMap((item) => Object.values(item))
      .filter((op) => (op as { requestBody?: unknown }).requestBody)
      .map((op) => op as { operationId: string; requestBody: { content: Record<string, { example?: unknown }> } });
    for (const op of shown) {
      const json = op.requestBody.content["application/json"];
      if (json) expect(json.example, op.operationId).toEqual(REQUEST_EXAMPLES[op.operationId as ExampleOperation]);
    }
  });

  it("has no field notes left over from fields the schemas no longer have", () => {
    expect(stale).toEqual([]);
  });

  it("writes patterns without regex flags and nullable references as anyOf", () => {
    const text = JSON.stringify(document);
    expect(text).not.toMatch(/"pattern":"[^"]*\/[dgimsuy]+"/);
    expect(text).not.toContain('{"type":["object","null"]}]');
    const run = (document.components.schemas as Record<string, { properties: Record<string, unknown> }>).Run;
    expect(run.properties.results).toMatchObject({ anyOf: [{ $ref: "#/components/schemas/AnalysisResult" }, { type: "null" }] });
  });
});

describe("GET /api/v1/openapi.json", () => {
  it("serves the generated document to anyone, without credentials", async () => {
    const res = await request(appUrl()).get("/api/v1/openapi.json");
    expect(res.status).toBe(200);
    expect(res.headers["content-type"]).toMatch(/^application\/json/);
    expect(res.body).toEqual(buildOpenApiDocument().document);
    const result = await validate(res.body);
    expect(result.valid).toBe(true);
  });
});
