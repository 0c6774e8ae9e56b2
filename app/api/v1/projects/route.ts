import { apiHandler } from "@/lib/http/api-handler";
import { projectJson } from "@/lib/logbook/api-json";
import { created, queryObject, readJson } from "@/lib/logbook/http";
import { createProject, listProjects } from "@/lib/logbook/projects";
import { projectInputSchema, projectListQuerySchema } from "@/lib/validations/project";

export const dynamic = "force-dynamic";

/** Projects, newest first: `{items, nextCursor}`; `?q=` searches name and purpose; `?cursor=&limit=` (≤ 200). */
export const GET = apiHandler({ action: "read" }, async (request, _context, user) => {
  const query = projectListQuerySchema.parse(queryObject(request));
  const page = await listProjects(user, query);
  return Response.json({ items: page.items.map(projectJson), nextCursor: page.nextCursor });
});

/** New project (engineer and above): `{name, purpose}` → 201 with the project and its Location. */
export const POST = apiHandler({ action: "project:write" }, async (request, _context, user) => {
  const input = projectInputSchema.parse(await readJson(request));
  const project = await createProject({ user }, input);
  return created(projectJson(project), `/api/v1/projects/${project.id}`);
});
