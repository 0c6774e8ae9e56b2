import { db } from "@/db/index";
import { getBuild, getBuildForUpdate, updateBuildAsBuilt } from "@/db/queries/builds";
import { getDesign } from "@/db/queries/designs";
import * as q from "@/db/queries/tweaks";
import { requirePermission } from "@/lib/auth/require-permission";
import { BadRequestError, ConflictError, NotFoundError } from "@/lib/errors";
import { zodFields } from "@/lib/http/problem";
import { designProblemsByField } from "@/lib/validations/design";
import { tweakInputSchemaFor } from "@/lib/validations/tweak";
import { oscillatorDesign } from "./prediction";
import { audit, isId, type Actor } from "./context";

/**
 * Logs a tweak on a build (technician and above). The input is validated here with the schema of the build's
 * topology (a part's unit depends on it). An applied part change updates the as-built values in the same
 * transaction; a planned one only records the intent.
 * @param raw - form or JSON fields: partRef, toValue, note, planned
 * @param options.at - back-dated time (the demo seed's history); the database clock otherwise
 * @throws NotFoundError; BadRequestError with field errors
 */
export async function logTweak(actor: Actor, buildId: string, raw: unknown, options: { at?: Date } = {}): Promise<q.Tweak> {
  const user = requirePermission(actor.user, "tweak:create");
  const build = isId(buildId) ? await getBuild(buildId) : null;
  if (!build) throw new NotFoundError("The build");
  const design = await getDesign(build.designId);
  if (!design) throw new NotFoundError("The design");
  const parsed = tweakInputSchemaFor(design.topology).safeParse(raw);
  if (!parsed.success) throw new BadRequestError("The tweak needs fixing.", zodFields(parsed.error));
  const input = parsed.data;

  return db().transaction(async (trx) => {
    const locked = (await getBuildForUpdate(buildId, trx))!;
    let fromValue: number | null = null;
    if (input.partRef) {
      const before = locked.asBuilt[input.partRef];
      fromValue = before?.valueSi ?? null;
      // A part the design leaves optional (Hartley's M or k) takes no tolerance until someone gives one.
      const asBuilt = { ...locked.asBuilt, [input.partRef]: { ...(before ?? {}), valueSi: input.toValue as number } };
      // The value alone may be plausible while the build it makes is not (C2 ×1000 leaves β = C1/C2 at 10⁻³): a
      // planned tweak is checked too, so nothing unbuildable is logged to try.
      // Only what this part causes: a value stored before the limits existed must not block the tweak that fixes it.
      const fields = designProblemsByField(oscillatorDesign(design.topology, asBuilt, design.revision.extraCapacitanceF, design.revision.windings));
      const problems = [...(fields[`parts.${input.partRef}.value`] ?? []), ...(fields.parts ?? [])];
      if (problems.length > 0) {
        throw new BadRequestError("The tweak needs fixing.", { toValue: problems.map((p) => p.charAt(0).toUpperCase() + p.slice(1) + ".") });
      }
      if (!input.planned) await updateBuildAsBuilt(buildId, asBuilt, trx);
    }
    const tweak = await q.createTweak(
      { buildId, partRef: input.partRef, fromValue, toValue: input.toValue, note: input.note, planned: input.planned, createdBy: user.id, createdAt: options.at },
      trx,
    );
    await audit(
      { ...actor, user },
      input.planned ? "tweak.planned" : "tweak.logged",
      { type: "tweak", id: tweak.id },
      { buildId, partRef: input.partRef, fromValue, toValue: input.toValue, note: input.note },
      trx,
    );
    return tweak;
  });
}

/**
 * Applies a planned tweak: its part takes the planned value now (technician and above).
 * @param buildId - when given, a tweak of another build is not found (the API addresses tweaks under their build)
 * @throws NotFoundError; ConflictError when it was applied already
 */
export async function applyPlannedTweak(actor: Actor, tweakId: string, buildId?: string): Promise<q.Tweak> {
  const user = requirePermission(actor.user, "tweak:create");
  const tweak = isId(tweakId) ? await q.getTweak(tweakId) : null;
  if (!tweak || (buildId !== undefined && tweak.buildId !== buildId)) throw new NotFoundError("The tweak");
  if (!tweak.planned) throw new ConflictError("This tweak is already applied.");
  return db().transaction(async (trx) => {
    const build = (await getBuildForUpdate(tweak.buildId, trx))!;
    const before = tweak.partRef ? build.asBuilt[tweak.partRef] : undefined;
    if (!(await q.markTweakApplied(tweakId, before?.valueSi ?? tweak.fromValue, trx))) throw new ConflictError("This tweak is already applied.");
    if (tweak.partRef && tweak.toValue !== null) {
      await updateBuildAsBuilt(tweak.buildId, { ...build.asBuilt, [tweak.partRef]: { ...(before ?? {}), valueSi: tweak.toValue } }, trx);
    }
    await audit({ ...actor, user }, "tweak.applied", { type: "tweak", id: tweakId }, { buildId: tweak.buildId }, trx);
    return (await q.getTweak(tweakId, trx))!;
  });
}
