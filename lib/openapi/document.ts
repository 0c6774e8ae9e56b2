import { OpenAPIRegistry, OpenApiGeneratorV31 } from "@asteasolutions/zod-to-openapi";
import { namedSchemas } from "./documented";
import { applyNotes } from "./field-notes";
import { normaliseDocument } from "./normalise";
import { SECURITY_SCHEMES, TAGS } from "./operation";
import { registerAccountPaths } from "./paths/account";
import { registerBuildPaths } from "./paths/builds";
import { registerDesignPaths } from "./paths/designs";
import { registerLayoutPaths } from "./paths/layouts";
import { registerMetaPaths } from "./paths/meta";
import { registerProjectPaths } from "./paths/projects";
import { registerReviewPaths } from "./paths/reviews";
import { registerRunExcerptPaths } from "./paths/run-excerpt";
import { registerRunPaths } from "./paths/runs";
import { registerSensitivityPaths } from "./paths/sensitivity";
import { registerTweakApplyPaths } from "./paths/tweak-apply";
import { registerUploadPaths } from "./paths/uploads";

/** The generated document as plain JSON (what /api/v1/openapi.json serves). */
export type OpenApiDocument = Record<string, unknown> & {
  openapi: string;
  info: { title: string; version: string; description?: string };
  paths: Record<string, Record<string, Record<string, unknown>>>;
  components: Record<string, Record<string, unknown>>;
};

const API_DESCRIPTION = `The JSON API of Tankbook: the same route handlers serve the app's own pages and bench scripts.

**Credentials.** Send an API token as \`Authorization: Bearer tbk_…\`. Make one on your profile page (it is shown once), or on the server with \`npm run -s create-token -- --email you@lab.example\`. A token acts with its owner's role. The browser's session cookie works too; writes with it must come from Tankbook's own origin.

**Roles.** viewer < technician < engineer < admin. Viewers read; technicians start builds, log tweaks and upload captures; engineers write projects and designs and review builds.

**Errors** are \`application/problem+json\` (RFC 9457): \`type\`, \`title\`, \`status\`, \`detail\`, and for bad input \`fields\` with the messages per field. 400 bad input, 401 no or bad credentials, 403 role too low, 404 unknown, 409 conflict (e.g. duplicate capture), 413 too large, 415 not a CSV, 429 throttled (failed sign-ins, or more writes a minute than API_WRITES_PER_MINUTE, 600 unless configured; wait for Retry-After).

**Lists** answer \`{items, nextCursor}\`; pass \`nextCursor\` back as \`?cursor=\` until it is null. \`?limit=\` takes 1 to 200.

**Idempotency.** \`POST /api/v1/builds/{buildId}/runs\` takes an \`Idempotency-Key\` header: a retry with the same key returns the first run instead of logging a second one.

**Conventions.** camelCase fields; SI units in the names (\`frequencyHz\`, \`capacitanceF\`, \`thdPercent\`, \`driftPpm\`); times in ISO 8601 UTC.`;

/** Builds the document from the registered operations; `stale` lists field notes that match no field. */
export function buildOpenApiDocument(): { document: OpenApiDocument; stale: string[] } {
  const registry = new OpenAPIRegistry();
  for (const [name, scheme] of Object.entries(SECURITY_SCHEMES)) registry.registerComponent("securitySchemes", name, { ...scheme });
  registerAccountPaths(registry);
  registerProjectPaths(registry);
  registerDesignPaths(registry);
  registerBuildPaths(registry);
  registerSensitivityPaths(registry);
  registerTweakApplyPaths(registry);
  registerRunPaths(registry);
  registerRunExcerptPaths(registry);
  registerUploadPaths(registry);
  registerReviewPaths(registry);
  registerLayoutPaths(registry);
  registerMetaPaths(registry);

  const components = [...namedSchemas.values()].map((schema) => ({ type: "schema" as const, schema }));
  const generated = new OpenApiGeneratorV31([...components, ...registry.definitions], { sortComponents: "alphabetically" }).generateDocument({
    openapi: "3.1.0",
    info: { title: "Tankbook API", version: "1.0.0", description: API_DESCRIPTION },
    servers: [{ url: "/", description: "This Tankbook server" }],
    tags: TAGS.map((t) => ({ ...t })),
    security: [{ bearerToken: [] }, { sessionCookie: [] }],
  });
  // A JSON round trip drops undefined values the generator leaves in, so the served and validated documents match.
  const document = JSON.parse(JSON.stringify(generated)) as OpenApiDocument;
  normaliseDocument(document);
  return { document, stale: applyNotes(document) };
}

let cached: OpenApiDocument | null = null;

/** The document, generated once per process (the schemas do not change while it runs). */
export function openApiDocument(): OpenApiDocument {
  cached ??= buildOpenApiDocument().document;
  return cached;
}
