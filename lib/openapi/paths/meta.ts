import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { jsonResponse, registerOperation } from "../operation";

export function registerMetaPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/openapi.json",
    operationId: "getOpenApiDocument",
    tag: "Meta",
    summary: "This OpenAPI document",
    description: "The OpenAPI 3.1 description of /api/v1, generated from the same zod schemas the handlers validate with.",
    action: null,
    responses: { 200: jsonResponse(z.record(z.string(), z.unknown()).describe("An OpenAPI 3.1 document."), "The document.") },
  });
}
