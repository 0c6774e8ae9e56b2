import { db } from "@/db/index";
import { listBuilds, type BuildFilter } from "@/db/queries/builds";
import * as q from "@/db/queries/designs";
import { getProject } from "@/db/queries/projects";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { BadRequestError, NotFoundError } from "@/lib/errors";
import { designProblemsByField, type DesignInput, type DesignPatch } from "@/lib/validations/design";
import { audit, isId, uniqueOr, type Actor } from "./context";
import { oscillatorDesign, predictDesign } from "./prediction";

/**
 * Creates a design (revision 1) in a project (engineer and above).
 * @param options.at - back-dated creation time (the demo seed's history); the database clock otherwise
 * @throws NotFoundError for an unknown project; ConflictError for a name taken in the project
 */
export async function createDesign(actor: Actor, projectId: string, input: DesignInput, options: { at?: Date } = {}): Promise<q.Design> {
  const user = requirePermission(actor.user, "design:write");
  if (!isId(projectId) || !(await getProject(projectId))) throw new NotFoundError("The project");
  return uniqueOr(`This project already has a design named “${input.name}”.`, () =>
    db().transaction(async (trx) => {
      const design = await q.createDesign(
        {
          projectId,
          name: input.name,
          topology: input.topology,
          parts: input.parts,
          extraCapacitanceF: input.extraCapacitanceF,
          windings: input.windings,
          spec: input.spec,
          changeNote: input.changeNote,
          createdBy: user.id,
          createdAt: options.at,
        },
        trx,
      );
      await audit({ ...actor, user }, "design.created", { type: "design", id: design.id }, { projectId, name: design.name, topology: design.topology }, trx);
      return design;
    }),
  );
}

/**
 * Edits a design by adding a revision (engineer and above): the parts given replace those refs, a spec given
 * replaces the spec. Runs already logged keep the revision they were measured against.
 * @throws NotFoundError; BadRequestError with field errors when the merged design is not usable
 */
export async function reviseDesign(actor: Actor, designId: string, patch: DesignPatch): Promise<q.Design> {
  const user = requirePermission(actor.user, "design:write");
  const current = isId(designId) ? await q.getDesign(designId) : null;
  if (!current) throw new NotFoundError("The design");
  const rev = current.revision;
  const parts = { ...rev.parts, ...(patch.parts ?? {}) };
  const extraCapacitanceF = patch.extraCapacitanceF === undefined ? rev.extraCapacitanceF : patch.extraCapacitanceF;
  const windings = current.topology !== "hartley" ? null : patch.windings === undefined ? rev.windings : patch.windings;
  const fields = designProblemsByField(oscillatorDesign(current.topology, parts, extraCapacitanceF, windings));
  if (Object.keys(fields).length > 0) throw new BadRequestError("The design would not be usable with these values.", fields);
  return uniqueOr(`This project already has a design named “${patch.name}”.`, () =>
    db().transaction(async (trx) => {
      const design = await q.createDesignRevision(
        designId,
        { parts, extraCapacitanceF, windings, spec: patch.spec ?? rev.spec, changeNote: patch.changeNote, createdBy: user.id, name: patch.name },
        trx,
      );
      if (!design) throw new NotFoundError("The design");
      await audit(
        { ...actor, user },
        "design.revised",
        { type: "design", id: designId },
        { revision: design.currentRevision, changed: Object.keys(patch).filter((k) => (patch as Record<string, unknown>)[k] !== undefined) },
        trx,
      );
      return design;
    }),
  );
}

/** @throws NotFoundError */
export async function getDesign(user: CurrentUser | null, designId: string): Promise<q.Design> {
  requirePermission(user, "read");
  const design = isId(designId) ? await q.getDesign(designId) : null;
  if (!design) throw new NotFoundError("The design");
  return design;
}

/** The design page: the design, its live prediction and bands, its revision history and a page of builds. */
export async function getDesignView(user: CurrentUser | null, designId: string, filter: BuildFilter = {}) {
  const design = await getDesign(user, designId);
  const [revisions, builds] = await Promise.all([q.listDesignRevisions(designId), listBuilds(designId, filter)]);
  const { prediction, error } = predictDesign(design);
  return { design, prediction, predictionError: error, revisions, builds };
}

/** A project's designs (for the API list). */
export async function listProjectDesigns(user: CurrentUser | null, projectId: string, filter: q.DesignFilter = {}) {
  requirePermission(user, "read");
  if (!isId(projectId) || !(await getProject(projectId))) throw new NotFoundError("The project");
  const page = await q.listDesigns(projectId, filter);
  return { items: page.items.map((d) => ({ ...d, prediction: predictDesign(d).prediction })), nextCursor: page.nextCursor };
}
