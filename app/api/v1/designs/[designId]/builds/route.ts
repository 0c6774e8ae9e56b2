import { apiHandler } from "@/lib/http/api-handler";
import { buildJson } from "@/lib/logbook/api-json";
import { createBuild, listDesignBuilds } from "@/lib/logbook/builds";
import { created, queryObject, readJson } from "@/lib/logbook/http";
import { buildInputSchema, buildListQuerySchema } from "@/lib/validations/build";

export const dynamic = "force-dynamic";

type Params = { designId: string };

/** A design's builds, newest first, with run count and latest run: `{items, nextCursor}`; `?q=&status=&kind=`. */
export const GET = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { designId } = await context.params;
  const page = await listDesignBuilds(user, designId, buildListQuerySchema.parse(queryObject(request)));
  return Response.json({ items: page.items.map((b) => buildJson(b)), nextCursor: page.nextCursor });
});

/** New build (technician and above): `{label, kind: breadboard|perfboard|pcb|other, kindRevision?, builtBy?}`. */
export const POST = apiHandler<Params>({ action: "build:create" }, async (request, context, user) => {
  const { designId } = await context.params;
  const build = await createBuild({ user }, designId, buildInputSchema.parse(await readJson(request)));
  return created(buildJson(build), `/api/v1/builds/${build.id}`);
});
