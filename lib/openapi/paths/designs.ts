import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { TOPOLOGIES } from "@/lib/oscillator";
import { buildInputSchema, buildListQuerySchema } from "@/lib/validations/build";
import { designPatchSchemaFor } from "@/lib/validations/design";
import { REQUEST_EXAMPLES } from "../examples";
import { jsonBody, jsonResponse, locationHeader, pathId, registerOperation } from "../operation";
import { buildPageSchema, buildSchema } from "../schemas/build";
import { designDetailSchema, designSchema } from "../schemas/design";

const designParams = z.object({ designId: pathId("design") });

export function registerDesignPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/designs/{designId}",
    operationId: "getDesign",
    tag: "Designs",
    summary: "Get a design",
    description: "The current revision with its prediction and tolerance bands (Hz), and every revision newest first.",
    action: "read",
    params: designParams,
    responses: { 200: jsonResponse(designDetailSchema, "The design.") },
  });
  registerOperation(registry, {
    method: "patch",
    path: "/api/v1/designs/{designId}",
    operationId: "reviseDesign",
    tag: "Designs",
    summary: "Edit a design (adds a revision)",
    description:
      "Every field is optional. Parts given replace those references (the others stay), a spec given replaces the " +
      "spec, `extraCapacitance: \"\"` or null clears it. Runs already logged keep the revision they were measured against.",
    action: "design:write",
    params: designParams,
    // The body's shape is the same for every topology; only how part values are read (F or H) depends on it.
    body: jsonBody(designPatchSchemaFor(TOPOLOGIES[0]), "DesignPatch", { example: REQUEST_EXAMPLES.reviseDesign }),
    responses: { 200: jsonResponse(designSchema, "The design at its new revision.") },
    problems: { 400: "A field failed validation, or the merged design would not be usable (see `fields`).", 409: "The project already has a design with this name." },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/designs/{designId}/builds",
    operationId: "listDesignBuilds",
    tag: "Builds",
    summary: "List a design's builds",
    description: "Newest first, each with its run count and latest run.",
    action: "read",
    params: designParams,
    query: buildListQuerySchema,
    responses: { 200: jsonResponse(buildPageSchema, "A page of builds.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/designs/{designId}/builds",
    operationId: "createBuild",
    tag: "Builds",
    summary: "Start a build",
    description: "A new prototype of the design; its as-built values start as the design's current ones.",
    action: "build:create",
    params: designParams,
    body: jsonBody(buildInputSchema, "BuildInput", { example: REQUEST_EXAMPLES.createBuild }),
    responses: { 201: jsonResponse(buildSchema, "The build created.", locationHeader("the new build")) },
    problems: { 409: "The design already has a build with this label." },
  });
}
