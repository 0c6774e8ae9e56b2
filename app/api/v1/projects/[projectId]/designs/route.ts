import { apiHandler } from "@/lib/http/api-handler";
import { designJson } from "@/lib/logbook/api-json";
import { createDesign, listProjectDesigns } from "@/lib/logbook/designs";
import { created, queryObject, readJson } from "@/lib/logbook/http";
import { predictDesign } from "@/lib/logbook/prediction";
import { designInputSchema, designListQuerySchema } from "@/lib/validations/design";

export const dynamic = "force-dynamic";

type Params = { projectId: string };

/** A project's designs, newest first, each with its prediction: `{items, nextCursor}`; `?q=&topology=`. */
export const GET = apiHandler<Params>({ action: "read" }, async (request, context, user) => {
  const { projectId } = await context.params;
  const page = await listProjectDesigns(user, projectId, designListQuerySchema.parse(queryObject(request)));
  return Response.json({ items: page.items.map((d) => designJson(d, d.prediction)), nextCursor: page.nextCursor });
});

/**
 * New design (engineer and above): `{name, topology, parts: {REF: {value, tolerance?, tempco?}}, extraCapacitance?,
 * windings?, spec?}`; values as numbers in SI units or text ("4n7", "10 µH", "412.3k"), tolerance "5%" or a fraction.
 */
export const POST = apiHandler<Params>({ action: "design:write" }, async (request, context, user) => {
  const { projectId } = await context.params;
  const input = designInputSchema.parse(await readJson(request));
  const design = await createDesign({ user }, projectId, input);
  return created(designJson(design, predictDesign(design).prediction), `/api/v1/designs/${design.id}`);
});
