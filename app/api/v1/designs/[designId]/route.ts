import { BadRequestError } from "@/lib/errors";
import { apiHandler } from "@/lib/http/api-handler";
import { designJson, revisionJson } from "@/lib/logbook/api-json";
import { getDesign, getDesignView, reviseDesign } from "@/lib/logbook/designs";
import { readJson } from "@/lib/logbook/http";
import { predictDesign } from "@/lib/logbook/prediction";
import { TOPOLOGIES, type Topology } from "@/lib/oscillator";
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

const PATCH_KEYS = new Set(["name", "parts", "extraCapacitance", "windings", "spec", "changeNote", "topology"]);

/**
 * Refuses a PATCH body that would write an empty revision: not an object, unknown keys (the schema would drop
 * them silently), a topology that is unknown or not the design's own (it is fixed at creation).
 * @throws BadRequestError naming the field
 */
function checkPatchBody(body: unknown, topology: Topology): void {
  if (body === null || typeof body !== "object" || Array.isArray(body)) throw new BadRequestError("Send the changes as a JSON object.");
  const unknown = Object.keys(body).filter((k) => !PATCH_KEYS.has(k));
  if (unknown.length > 0) {
    throw new BadRequestError(`Unknown field${unknown.length > 1 ? "s" : ""} ${unknown.map((k) => `“${k}”`).join(", ")}: a design has name, parts, extraCapacitance, windings, spec and changeNote.`, Object.fromEntries(unknown.map((k) => [k, ["unknown field"]])));
  }
  const sent = (body as { topology?: unknown }).topology;
  if (sent === undefined) return;
  if (typeof sent !== "string" || !(TOPOLOGIES as readonly string[]).includes(sent)) {
    throw new BadRequestError(`Unknown topology; Tankbook knows ${TOPOLOGIES.join(", ")}.`, { topology: ["unknown topology"] });
  }
  if (sent !== topology) throw new BadRequestError(`A design's topology is fixed (this one is ${topology}); start a new design for another.`, { topology: ["cannot change"] });
}

/** Edit a design (engineer and above) = a new revision: `{name?, parts?, extraCapacitance?, windings?, spec?, changeNote?}`. */
export const PATCH = apiHandler<Params>({ action: "design:write" }, async (request, context, user) => {
  const { designId } = await context.params;
  const current = await getDesign(user, designId);
  const body = await readJson(request);
  checkPatchBody(body, current.topology);
  const patch = designPatchSchemaFor(current.topology).parse(body);
  // A note alone is a deliberate entry in the design's history; an empty body is not.
  const changes = [patch.name, patch.parts, patch.extraCapacitanceF, patch.windings, patch.spec];
  if (changes.every((v) => v === undefined) && patch.changeNote === "") {
    throw new BadRequestError("Nothing to change: send at least one of name, parts, extraCapacitance, windings, spec or changeNote.");
  }
  const design = await reviseDesign({ user }, designId, patch);
  return Response.json(designJson(design, predictDesign(design).prediction));
});
