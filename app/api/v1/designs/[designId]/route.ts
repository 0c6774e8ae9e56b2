import { apiHandler } from "@/lib/http/api-handler";
import { designJson, revisionJson } from "@/lib/logbook/api-json";
import { getDesign, getDesignView, reviseDesign } from "@/lib/logbook/designs";
import { readJson } from "@/lib/logbook/http";
import { predictDesign } from "@/lib/logbook/prediction";
import { designPatchSchemaFor } from "@/lib/validations/design";

export const dynamic = "force-dynamic";

type Params = { designId: string };

/** A design with its prediction and tolerance bands (Hz) and its revision history, newest first. */
export const GET = apiHandler<Params>({ action: "read" }, async (_request, context, user) => {
  const { designId } = await context.params;
  const view = await getDesignView(user, designId, { limit: 1 });
  return Response.json({
    ...designJson(view.design, view.prediction),
    predictionError: view.predictionError,
    revisions: view.revisions.map(revisionJson),
  });
});

/** Edit a design (engineer and above) = a new revision: `{name?, parts?, extraCapacitance?, windings?, spec?, changeNote?}`. */
export const PATCH = apiHandler<Params>({ action: "design:write" }, async (request, context, user) => {
  const { designId } = await context.params;
  const current = await getDesign(user, designId);
  const patch = designPatchSchemaFor(current.topology).parse(await readJson(request));
  const design = await reviseDesign({ user }, designId, patch);
  return Response.json(designJson(design, predictDesign(design).prediction));
});
