import { listTweaks } from "@/db/queries/tweaks";
import { apiHandler } from "@/lib/http/api-handler";
import { tweakJson } from "@/lib/logbook/api-json";
import { getBuild } from "@/lib/logbook/builds";
import { created, readJson } from "@/lib/logbook/http";
import { logTweak } from "@/lib/logbook/tweaks";

export const dynamic = "force-dynamic";

type Params = { buildId: string };

/** A build's tweaks, oldest first: `{items, nextCursor: null}` (a build's log is short). */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { buildId } = await context.params;
  const build = await getBuild(user, buildId);
  return Response.json({ items: (await listTweaks(build.id)).map(tweakJson), nextCursor: null });
});

/**
 * Log a tweak (technician and above): `{partRef?, toValue?, note?, planned?}` — a part's new value ("3n9" or SI
 * number) and/or a note. An applied part change updates the as-built values.
 */
export const POST = apiHandler<Params>({ action: "tweak:create" }, async (request, context, user) => {
  const { buildId } = await context.params;
  const tweak = await logTweak({ user }, buildId, await readJson(request));
  return created(tweakJson(tweak), `/api/v1/builds/${buildId}/tweaks`);
});
