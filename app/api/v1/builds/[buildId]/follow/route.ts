import { getBuild } from "@/db/queries/builds";
import { getFollowStatus } from "@/db/queries/follows";
import { clientIp } from "@/lib/auth/client-ip";
import { NotFoundError } from "@/lib/errors";
import { apiHandler } from "@/lib/http/api-handler";
import { isId } from "@/lib/logbook/context";
import { followBuild, unfollowBuild } from "@/lib/logbook/review";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/** Whether you follow the build: `{following, via: "build"|"project"|"maker"|null, followsProject, isMaker}`. */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { buildId } = await context.params;
  if (!isId(buildId) || !(await getBuild(buildId))) throw new NotFoundError("The build");
  return Response.json(await getFollowStatus(user.id, buildId));
});

/** Follow the build (its flags are e-mailed to you, as your notification choice allows): 200 with the status. */
export const PUT = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { buildId } = await context.params;
  return Response.json(await followBuild(user, { buildId }, { ip: clientIp(request.headers) }));
});

/** Stop following the build, also when you follow it as its maker or through its project: 200 with the status. */
export const DELETE = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { buildId } = await context.params;
  return Response.json(await unfollowBuild(user, { buildId }, { ip: clientIp(request.headers) }));
});
