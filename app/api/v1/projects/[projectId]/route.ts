import { apiHandler } from "@/lib/http/api-handler";
import { projectJson } from "@/lib/logbook/api-json";
import { readJson } from "@/lib/logbook/http";
import { getProject, updateProject } from "@/lib/logbook/projects";
import { projectPatchSchema } from "@/lib/validations/project";

export const dynamic = "force-dynamic";

type Params = { projectId: string };

export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { projectId } = await context.params;
  return Response.json(projectJson(await getProject(user, projectId)));
});

/** Rename a project or change its purpose (engineer and above): `{name?, purpose?}`. */
export const PATCH = apiHandler<Params>({ action: "project:write" }, async (request, context, user) => {
  const { projectId } = await context.params;
  const patch = projectPatchSchema.parse(await readJson(request));
  return Response.json(projectJson(await updateProject({ user }, projectId, patch)));
});
