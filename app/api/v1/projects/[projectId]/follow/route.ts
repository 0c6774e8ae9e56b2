import { isFollowingProject } from "@/db/queries/follows";
import { getProject } from "@/lib/logbook/projects";
import { clientIp } from "@/lib/auth/client-ip";
import { NotFoundError } from "@/lib/errors";
import { apiHandler } from "@/lib/http/api-handler";
import { isId } from "@/lib/logbook/context";
import { followProject } from "@/lib/logbook/review";

export const dynamic = "force-dynamic";

type Params = { projectId: string };

/** Whether you follow the project: `{following}`. */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { projectId } = await context.params;
  if (!isId(projectId)) throw new NotFoundError("The project");
  await getProject(user, projectId); // 404 for a project that does not exist, like PUT and DELETE
  return Response.json({ following: await isFollowingProject(user.id, projectId) });
});

/** Follow every build of the project: 200 `{following: true}`. */
export const PUT = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { projectId } = await context.params;
  return Response.json(await followProject(user, { projectId, following: true }, { ip: clientIp(request.headers) }));
});

/** Stop following the project: 200 `{following: false}`. */
export const DELETE = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { projectId } = await context.params;
  return Response.json(await followProject(user, { projectId, following: false }, { ip: clientIp(request.headers) }));
});
