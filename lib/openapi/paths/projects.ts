import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { designInputSchema, designListQuerySchema } from "@/lib/validations/design";
import { projectInputSchema, projectListQuerySchema, projectPatchSchema } from "@/lib/validations/project";
import { partReferences } from "./part-references";
import { REQUEST_EXAMPLES } from "../examples";
import { jsonBody, jsonResponse, locationHeader, pathId, registerOperation } from "../operation";
import { designPageSchema, designSchema } from "../schemas/design";
import { projectPageSchema, projectSchema } from "../schemas/project";

const projectParams = z.object({ projectId: pathId("project") });

export function registerProjectPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/projects",
    operationId: "listProjects",
    tag: "Projects",
    summary: "List projects",
    description: "Newest first, with design, build and run counts. `q` searches name and purpose.",
    action: "read",
    query: projectListQuerySchema,
    responses: { 200: jsonResponse(projectPageSchema, "A page of projects.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/projects",
    operationId: "createProject",
    tag: "Projects",
    summary: "Create a project",
    action: "project:write",
    body: jsonBody(projectInputSchema, "ProjectInput", { example: REQUEST_EXAMPLES.createProject }),
    responses: { 201: jsonResponse(projectSchema, "The project created.", locationHeader("the new project")) },
    problems: { 409: "A project with this name exists already." },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/projects/{projectId}",
    operationId: "getProject",
    tag: "Projects",
    summary: "Get a project",
    action: "read",
    params: projectParams,
    responses: { 200: jsonResponse(projectSchema, "The project.") },
  });
  registerOperation(registry, {
    method: "patch",
    path: "/api/v1/projects/{projectId}",
    operationId: "updateProject",
    tag: "Projects",
    summary: "Rename a project or change its purpose",
    action: "project:write",
    params: projectParams,
    body: jsonBody(projectPatchSchema, "ProjectPatch", { example: REQUEST_EXAMPLES.updateProject }),
    responses: { 200: jsonResponse(projectSchema, "The project as changed.") },
    problems: { 409: "A project with this name exists already." },
  });
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/projects/{projectId}/designs",
    operationId: "listProjectDesigns",
    tag: "Designs",
    summary: "List a project's designs",
    description: "Newest first, each with its current prediction.",
    action: "read",
    params: projectParams,
    query: designListQuerySchema,
    responses: { 200: jsonResponse(designPageSchema, "A page of designs.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/projects/{projectId}/designs",
    operationId: "createDesign",
    tag: "Designs",
    summary: "Create a design",
    description:
      "Revision 1 of a new design. Part values are SI numbers or text the way people write them (“4n7”, “4.7 nF”, " +
      "“10 µH”, “412.3k”); tolerances “5%”, “J” or a fraction; tempcos “C0G”, “N750” or ppm/K. Part references " +
      `by topology: ${partReferences()}.`,
    action: "design:write",
    params: projectParams,
    body: jsonBody(designInputSchema, "DesignInput", { example: REQUEST_EXAMPLES.createDesign }),
    responses: { 201: jsonResponse(designSchema, "The design created, with its prediction.", locationHeader("the new design")) },
    problems: { 409: "The project already has a design with this name." },
  });
}
