import { db } from "@/db/index";
import * as q from "@/db/queries/builds";
import { getDesign } from "@/db/queries/designs";
import { listBuildFlags } from "@/db/queries/flags";
import { listRuns, type RunFilter } from "@/db/queries/runs";
import { listTweaks } from "@/db/queries/tweaks";
import { getUserById } from "@/db/queries/users";
import { authenticateRequest, authenticateRequestWith } from "@/lib/auth/authenticate-request";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { BadRequestError, NotFoundError } from "@/lib/errors";
import type { BuildInput } from "@/lib/validations/build";
import { audit, isId, uniqueOr, type Actor } from "./context";
import { oscillatorDesign, predict, predictBuild } from "./prediction";

async function checkBuilder(builtBy: string | undefined, fallback: string): Promise<string> {
  if (!builtBy || builtBy === fallback) return fallback;
  const person = await getUserById(builtBy);
  if (!person || person.status !== "active") throw new BadRequestError("Pick someone from the team as the builder.", { builtBy: ["unknown person"] });
  return person.id;
}

/**
 * Starts a build of a design (technician and above); its as-built parts are the design's current values.
 * @param options.at - back-dated creation time (the demo seed's history); the database clock otherwise
 * @throws NotFoundError; ConflictError when the design already has a build with this label
 */
export async function createBuild(actor: Actor, designId: string, input: BuildInput, options: { at?: Date } = {}): Promise<q.Build> {
  const user = requirePermission(actor.user, "build:create");
  const design = isId(designId) ? await getDesign(designId) : null;
  if (!design) throw new NotFoundError("The design");
  const builtBy = await checkBuilder(input.builtBy, user.id);
  return uniqueOr(`This design already has a build labelled “${input.label}”.`, () =>
    db().transaction(async (trx) => {
      const build = await q.createBuild(
        {
          designId,
          designRevisionId: design.revision.id,
          label: input.label,
          kind: input.kind,
          kindRevision: input.kindRevision,
          builtBy,
          asBuilt: design.revision.parts,
          createdBy: user.id,
          createdAt: options.at,
        },
        trx,
      );
      await audit({ ...actor, user }, "build.created", { type: "build", id: build.id }, { designId, label: build.label, kind: build.kind }, trx);
      return build;
    }),
  );
}

/** @throws NotFoundError */
export async function getBuild(user: CurrentUser | null, buildId: string): Promise<q.Build> {
  requirePermission(user, "read");
  const build = isId(buildId) ? await q.getBuild(buildId) : null;
  if (!build) throw new NotFoundError("The build");
  return build;
}

/** One entry of a build's history: a tweak or a run, in time order. */
export type TimelineEntry =
  | { kind: "tweak"; at: Date; tweak: Awaited<ReturnType<typeof listTweaks>>[number] }
  | { kind: "run"; at: Date; run: Awaited<ReturnType<typeof listRuns>>["items"][number] };

/**
 * The build page: build, design, the prediction for its as-built values, its tweaks, a page of runs (newest
 * first), the tweaks and those runs interleaved oldest first, its open flags and photos.
 */
export async function getBuildView(user: CurrentUser | null, buildId: string, runFilter: RunFilter = {}) {
  const build = await getBuild(user, buildId);
  const [design, tweaks, runs, flags, photos] = await Promise.all([
    getDesign(build.designId),
    listTweaks(buildId),
    listRuns(buildId, { limit: 200, ...runFilter }),
    listBuildFlags(buildId, { unacknowledgedOnly: true }),
    q.listBuildPhotos(buildId),
  ]);
  if (!design) throw new NotFoundError("The design");
  const { prediction, error } = predictBuild(build, design);
  const timeline: TimelineEntry[] = [
    ...tweaks.map((tweak) => ({ kind: "tweak" as const, at: tweak.createdAt, tweak })),
    ...runs.items.map((run) => ({ kind: "run" as const, at: run.createdAt, run })),
  ].sort((a, b) => a.at.getTime() - b.at.getTime());
  return { build, design, prediction, predictionError: error, tweaks, runs, timeline, flags, photos };
}

/**
 * `GET /api/v1/builds/{id}` for an API request: who asks, the build, the prediction for its as-built values, its
 * tweaks and open flags, read in the statement that looks up the caller's API token (authenticateRequestWith); the
 * permission check comes before anything read is used.
 * @throws UnauthorizedError, ForbiddenError, NotFoundError
 */
export async function getBuildDetailForRequest(request: Request, buildId: string) {
  const { user, data } = isId(buildId) ? await authenticateRequestWith(request, q.buildDetailRead(buildId)) : { user: await authenticateRequest(request), data: null };
  const allowed = requirePermission(user, "read");
  if (!data) throw new NotFoundError("The build");
  const { prediction, error } = cachedPrediction(data.topology, data.build.asBuilt, data.extraCapacitanceF, data.windings);
  return { user: allowed, detail: data, prediction, predictionError: error };
}

// A prediction runs a 20 000-trial tolerance simulation with a fixed seed (lib/oscillator/tolerance.ts): the largest
// piece of our own CPU time in the build detail's profile, and a pure function of these four inputs. The detail keeps
// the answers for the builds asked about lately, so a script polling a build pays it once, not on every request.
const PREDICTIONS_KEPT = 256;
const predictions = new Map<string, ReturnType<typeof predict>>();

function cachedPrediction(...inputs: Parameters<typeof oscillatorDesign>): ReturnType<typeof predict> {
  const key = JSON.stringify(inputs);
  const kept = predictions.get(key);
  if (kept) {
    // Least recently used goes first: re-inserting moves the key to the end of the Map's order.
    predictions.delete(key);
    predictions.set(key, kept);
    return kept;
  }
  const answer = predict(oscillatorDesign(...inputs));
  predictions.set(key, answer);
  if (predictions.size > PREDICTIONS_KEPT) predictions.delete(predictions.keys().next().value!);
  return answer;
}

/** A design's builds (for the API list). */
export async function listDesignBuilds(user: CurrentUser | null, designId: string, filter: q.BuildFilter = {}) {
  requirePermission(user, "read");
  if (!isId(designId) || !(await getDesign(designId))) throw new NotFoundError("The design");
  return q.listBuilds(designId, filter);
}

/**
 * Records the accuracy of the scope's timebase on a build's bench (technician and above), so absolute frequencies
 * carry it in their uncertainty; null clears it. Stored verdicts change at the next analysis or re-analysis.
 * @throws NotFoundError
 */
export async function setBuildTimebase(actor: Actor, buildId: string, timebasePpm: number | null): Promise<q.Build> {
  const user = requirePermission(actor.user, "build:create");
  const build = isId(buildId) ? await q.getBuild(buildId) : null;
  if (!build) throw new NotFoundError("The build");
  return db().transaction(async (trx) => {
    const updated = await q.updateBuildTimebase(buildId, timebasePpm, trx);
    if (!updated) throw new NotFoundError("The build");
    await audit({ ...actor, user }, "build.timebase", { type: "build", id: buildId }, { from: build.timebasePpm, to: timebasePpm }, trx);
    return updated;
  });
}
