import type { Knex } from "knex";
import { db } from "@/db/index";
import { recordAudit } from "@/db/queries/audit";
import { getBuild, getBuildForUpdate, updateBuildReview, type Build } from "@/db/queries/builds";
import { getBuildTableRow } from "@/db/queries/dashboard";
import { acknowledgeFlag as acknowledgeFlagRow, listRunFlags, type Flag } from "@/db/queries/flags";
import { followProject as followProjectRow, getFollowStatus, setBuildFollow, unfollowProject as unfollowProjectRow, type FollowStatus } from "@/db/queries/follows";
import { getProject } from "@/db/queries/projects";
import { getFlagTarget, getReviewBasis, setReviewBasis, type ReviewBasis } from "@/db/queries/reviews";
import { getRun, type Run } from "@/db/queries/runs";
import { createTweak, listTweaks, type Tweak } from "@/db/queries/tweaks";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { requirePermission } from "@/lib/auth/require-permission";
import type { RequestMeta } from "@/lib/auth/sign-in";
import { BadRequestError, ConflictError, NotFoundError } from "@/lib/errors";
import { formatEngineering } from "@/lib/oscillator/units";
import { suggestRetune, type RetuneSuggestion } from "@/lib/oscillator/retune";
import type { ESeriesName } from "@/lib/oscillator/e-series";
import { getLatestAnalysedRunId } from "@/db/queries/alerts";
import { REASON_REQUIRED_MESSAGE, acceptReasonSchema } from "@/lib/validations/review";
import { isId } from "./context";

// Sign-off, flags, follows and the planned retune: the services behind the review actions and the /api/v1 routes.
// Each one checks the caller's permission (requirePermission) and writes an audit row in the same transaction.
// Inputs arrive already parsed by lib/validations/review.ts; the one rule that needs the database (a flagged
// build needs a reason to be accepted) is checked here.

/** A build after a review, with what the decision was based on. */
export interface ReviewOutcome {
  build: Build;
  basis: ReviewBasis;
  /** Rules the latest analysed run failed when the decision was made (empty when it passed or there was none). */
  flaggedRules: string[];
}

function checkId(id: string, what: string): void {
  if (!isId(id)) throw new NotFoundError(what);
}

async function lockedBuild(buildId: string, trx: Knex.Transaction): Promise<Build> {
  checkId(buildId, "That build");
  const build = await getBuildForUpdate(buildId, trx);
  if (!build) throw new NotFoundError("That build");
  return build;
}

async function latestVerdict(buildId: string, trx: Knex.Transaction): Promise<{ runId: string | null; flaggedRules: string[] }> {
  const row = await getBuildTableRow(buildId, trx);
  const run = row?.latestRun ?? null;
  if (!run) return { runId: null, flaggedRules: [] };
  const rules = run.verdict === "fail" ? [...new Set((await listRunFlags(run.id, trx)).map((f) => f.rule))].sort() : [];
  return { runId: run.id, flaggedRules: rules };
}

/**
 * Accepts a build (engineer and above). When its latest analysed run is flagged the engineer must give a reason,
 * which is stored with the build and in the audit log together with the rules that failed.
 *
 * @param input.comment - optional remark shown with the sign-off
 * @param input.reason - required (non-empty) when the latest run is flagged; ignored otherwise
 * @throws UnauthorizedError, ForbiddenError (role), NotFoundError (build), BadRequestError with `fields.reason`
 *   when a flagged build comes without a reason
 */
export async function acceptBuild(
  actor: CurrentUser | null,
  input: { buildId: string; comment?: string | null; reason?: string | null },
  meta: RequestMeta,
): Promise<ReviewOutcome> {
  const user = requirePermission(actor, "build:review");
  return db().transaction(async (trx) => {
    const before = await lockedBuild(input.buildId, trx);
    const latest = await latestVerdict(input.buildId, trx);
    let reason: string | null = null;
    if (latest.flaggedRules.length > 0) {
      const parsed = acceptReasonSchema.safeParse(input.reason ?? "");
      if (!parsed.success) throw new BadRequestError(REASON_REQUIRED_MESSAGE, { reason: [parsed.error.issues[0]?.message ?? REASON_REQUIRED_MESSAGE] });
      reason = parsed.data;
    }
    const comment = input.comment?.trim() || null;
    const build = (await updateBuildReview(input.buildId, { status: "accepted", comment, reviewedBy: user.id }, trx))!;
    const basis = { reason, runId: latest.runId };
    await setReviewBasis(input.buildId, basis, trx);
    await recordAudit(
      {
        actorId: user.id,
        action: "build.accepted",
        entityType: "build",
        entityId: input.buildId,
        detail: { from: before.status, comment, flagged: latest.flaggedRules.length > 0, reason, runId: latest.runId, flaggedRules: latest.flaggedRules },
        ip: meta.ip,
      },
      trx,
    );
    return { build, basis, flaggedRules: latest.flaggedRules };
  });
}

/**
 * Rejects a build with the engineer's comment (engineer and above).
 * @throws UnauthorizedError, ForbiddenError, NotFoundError; BadRequestError when the comment is blank
 */
export async function rejectBuild(actor: CurrentUser | null, input: { buildId: string; comment: string }, meta: RequestMeta): Promise<ReviewOutcome> {
  const user = requirePermission(actor, "build:review");
  const comment = input.comment?.trim();
  if (!comment) throw new BadRequestError("Say why the build is rejected.", { comment: ["Say why the build is rejected."] });
  return db().transaction(async (trx) => {
    const before = await lockedBuild(input.buildId, trx);
    const latest = await latestVerdict(input.buildId, trx);
    const build = (await updateBuildReview(input.buildId, { status: "rejected", comment, reviewedBy: user.id }, trx))!;
    const basis = { reason: null, runId: latest.runId };
    await setReviewBasis(input.buildId, basis, trx);
    await recordAudit(
      { actorId: user.id, action: "build.rejected", entityType: "build", entityId: input.buildId, detail: { from: before.status, comment, runId: latest.runId, flaggedRules: latest.flaggedRules }, ip: meta.ip },
      trx,
    );
    return { build, basis, flaggedRules: latest.flaggedRules };
  });
}

/**
 * Puts an accepted or rejected build back to open (more work to do), clearing its sign-off (engineer and above).
 * @throws UnauthorizedError, ForbiddenError, NotFoundError
 */
export async function reopenBuild(actor: CurrentUser | null, input: { buildId: string; comment?: string | null }, meta: RequestMeta): Promise<ReviewOutcome> {
  const user = requirePermission(actor, "build:review");
  return db().transaction(async (trx) => {
    const before = await lockedBuild(input.buildId, trx);
    const build = (await updateBuildReview(input.buildId, { status: "open", comment: null, reviewedBy: null }, trx))!;
    const basis = { reason: null, runId: null };
    await setReviewBasis(input.buildId, basis, trx);
    await recordAudit(
      { actorId: user.id, action: "build.reopened", entityType: "build", entityId: input.buildId, detail: { from: before.status, comment: input.comment?.trim() || null, previousComment: before.reviewComment }, ip: meta.ip },
      trx,
    );
    return { build, basis, flaggedRules: [] };
  });
}

/**
 * One entry point for the three decisions, as the review form and POST /api/v1/builds/{id}/review send them.
 * @throws as {@link acceptBuild}, {@link rejectBuild}, {@link reopenBuild}
 */
export async function reviewBuild(
  actor: CurrentUser | null,
  input: { buildId: string; decision: "accept" | "reject" | "reopen"; comment?: string | null; reason?: string | null },
  meta: RequestMeta,
): Promise<ReviewOutcome> {
  if (input.decision === "accept") return acceptBuild(actor, input, meta);
  if (input.decision === "reject") return rejectBuild(actor, { buildId: input.buildId, comment: input.comment ?? "" }, meta);
  return reopenBuild(actor, input, meta);
}

/** The sign-off basis of a build for its page and report (reason for a flagged acceptance, the run judged). */
export async function getSignOff(buildId: string): Promise<ReviewBasis | null> {
  return isId(buildId) ? getReviewBasis(buildId) : null;
}

/**
 * Acknowledges a flag: someone responsible has seen it (engineer and above). Acknowledging twice is refused.
 * @returns the flag with who acknowledged it and when
 * @throws UnauthorizedError, ForbiddenError, NotFoundError; ConflictError when it was already acknowledged
 */
export async function acknowledgeFlag(actor: CurrentUser | null, input: { flagId: string }, meta: RequestMeta): Promise<Flag> {
  const user = requirePermission(actor, "flag:acknowledge");
  return db().transaction(async (trx) => {
    checkId(input.flagId, "That flag");
    const target = await getFlagTarget(input.flagId, trx);
    if (!target) throw new NotFoundError("That flag");
    const flag = await acknowledgeFlagRow(input.flagId, user.id, trx);
    if (!flag) throw new ConflictError("This flag was already acknowledged.");
    await recordAudit(
      { actorId: user.id, action: "flag.acknowledged", entityType: "flag", entityId: input.flagId, detail: { buildId: target.buildId, runId: target.runId, rule: target.rule }, ip: meta.ip },
      trx,
    );
    return flag;
  });
}

async function setFollow(actor: CurrentUser | null, buildId: string, following: boolean, meta: RequestMeta): Promise<FollowStatus> {
  const user = requirePermission(actor, "read");
  checkId(buildId, "That build");
  return db().transaction(async (trx) => {
    if (!(await getBuild(buildId, trx))) throw new NotFoundError("That build");
    await setBuildFollow(user.id, buildId, following, trx);
    await recordAudit({ actorId: user.id, action: following ? "build.followed" : "build.unfollowed", entityType: "build", entityId: buildId, ip: meta.ip }, trx);
    return getFollowStatus(user.id, buildId, trx);
  });
}

/**
 * Follows a build: its flags are e-mailed (subject to the profile's notification choice). Any signed-in role.
 * @returns the follow status after the change
 * @throws UnauthorizedError, NotFoundError
 */
export async function followBuild(actor: CurrentUser | null, input: { buildId: string }, meta: RequestMeta): Promise<FollowStatus> {
  return setFollow(actor, input.buildId, true, meta);
}

/**
 * Stops following a build, also when following it by default (its creator or builder) or through its project.
 * @throws UnauthorizedError, NotFoundError
 */
export async function unfollowBuild(actor: CurrentUser | null, input: { buildId: string }, meta: RequestMeta): Promise<FollowStatus> {
  return setFollow(actor, input.buildId, false, meta);
}

/**
 * Follows (or, with `following: false`, stops following) every build of a project. Any signed-in role.
 * @returns whether the person follows the project afterwards
 * @throws UnauthorizedError, NotFoundError
 */
export async function followProject(actor: CurrentUser | null, input: { projectId: string; following?: boolean }, meta: RequestMeta): Promise<{ following: boolean }> {
  const user = requirePermission(actor, "read");
  const following = input.following ?? true;
  checkId(input.projectId, "That project");
  return db().transaction(async (trx) => {
    if (!(await getProject(input.projectId, trx))) throw new NotFoundError("That project");
    if (following) await followProjectRow(user.id, input.projectId, trx);
    else await unfollowProjectRow(user.id, input.projectId, trx);
    await recordAudit({ actorId: user.id, action: following ? "project.followed" : "project.unfollowed", entityType: "project", entityId: input.projectId, ip: meta.ip }, trx);
    return { following };
  });
}

/** The retune suggestion for a build, from its latest analysed run. */
export interface BuildRetune {
  run: Pick<Run, "id" | "originalFilename" | "createdAt" | "measuredHz">;
  suggestion: RetuneSuggestion;
  /** The run's trust warnings (clipping, not steady, few cycles…), in the engine's words; the suggestion rests on them. */
  trustWarnings: string[];
}

/** The engine's trust warnings of a run's results, each as its sentence. */
function trustWarningsOf(results: Record<string, unknown> | null): string[] {
  const warnings = results?.warnings;
  if (!Array.isArray(warnings)) return [];
  return warnings
    .filter((w): w is { code: string; message?: unknown } => typeof w === "object" && w !== null && typeof (w as { code?: unknown }).code === "string")
    .map((w) => (typeof w.message === "string" ? w.message : w.code));
}

/** The spec's frequency tolerance in Hz around its target; undefined when the spec sets none. */
function toleranceHzOf(spec: { toleranceValue?: number | null; toleranceUnit?: string | null }, targetHz: number): number | undefined {
  if (typeof spec.toleranceValue !== "number") return undefined;
  return spec.toleranceUnit === "ppm" ? (targetHz * spec.toleranceValue) / 1e6 : (targetHz * spec.toleranceValue) / 100;
}

/**
 * The single standard-value change that brings the build nearest its target, computed by lib/oscillator from the
 * latest analysed run (its parts, the capacitance its measurement implies, the spec's target at that run).
 * @returns null when there is no analysed run, no measured frequency, or the spec has no target frequency
 * @throws ConflictError carrying lib/oscillator's reason when the stored values cannot be retuned (outside the bench
 *   limits, no realisable tank)
 */
export async function getRetuneSuggestion(
  buildId: string,
  // calibrationCapacitanceF: the lab's figure to take as real instead of the run's implied capacitance (lib/logbook/retune-aim).
  options: { series?: ESeriesName; calibrationCapacitanceF?: number } = {},
  trx: Knex | Knex.Transaction = db(),
): Promise<BuildRetune | null> {
  if (!isId(buildId)) return null;
  const runId = await getLatestAnalysedRunId(buildId, trx);
  if (!runId) return null;
  const run = await getRun(runId, trx);
  const targetHz = run?.snapshot.spec?.targetHz;
  if (!run || !run.measuredHz || !targetHz) return null;
  const { snapshot } = run;
  let suggestion: RetuneSuggestion;
  try {
    suggestion = suggestRetune(
      {
        topology: snapshot.topology,
        parts: snapshot.parts,
        ...(snapshot.extraCapacitanceF !== null ? { extraCapacitanceF: snapshot.extraCapacitanceF } : {}),
        ...(snapshot.windings ? { windings: snapshot.windings } : {}),
      },
      {
        targetHz,
        measuredHz: run.measuredHz,
        series: options.series ?? "E12",
        targetToleranceHz: toleranceHzOf(snapshot.spec, targetHz),
        ...(options.calibrationCapacitanceF !== undefined ? { calibrationCapacitanceF: options.calibrationCapacitanceF } : {}),
      },
    );
  } catch (err) {
    // Values stored before the bench limits (a 1e30 Hz target) are the data's problem, not a server fault.
    if (err instanceof RangeError) throw new ConflictError(`The retune cannot be computed for this run: ${err.message}.`);
    throw err;
  }
  return {
    run: { id: run.id, originalFilename: run.originalFilename, createdAt: run.createdAt, measuredHz: run.measuredHz },
    suggestion,
    trustWarnings: trustWarningsOf(run.results),
  };
}

function valueText(valueSi: number, unit: "F" | "H"): string {
  return formatEngineering(valueSi, unit, 3);
}

/**
 * Logs the build's retune suggestion as a planned tweak in one click (technician and above). The as-built values
 * do not change until the tweak is carried out. Clicking again while the same change is planned returns that tweak.
 *
 * @returns the planned tweak, and whether this call created it (false: the same change was already planned)
 * @throws UnauthorizedError, ForbiddenError, NotFoundError; ConflictError when there is nothing to suggest (no analysed
 *   run with a measured frequency, no target, the current value is already nearest) or the part changed since that run
 */
export async function planRetuneTweak(
  actor: CurrentUser | null,
  input: { buildId: string; series?: ESeriesName; calibrationCapacitanceF?: number },
  meta: RequestMeta,
): Promise<{ tweak: Tweak; created: boolean }> {
  const user = requirePermission(actor, "tweak:create");
  return db().transaction(async (trx) => {
    const build = await lockedBuild(input.buildId, trx);
    const retune = await getRetuneSuggestion(input.buildId, { series: input.series, calibrationCapacitanceF: input.calibrationCapacitanceF }, trx);
    if (!retune) throw new ConflictError("There is no retune suggestion yet: it needs an analysed run with a measured frequency and a target frequency in the spec.");
    const s = retune.suggestion;
    if (s.onTarget) throw new ConflictError("The build is on target within the spec's tolerance: no tweak needed.");
    if (!s.reachable) throw new ConflictError(`No single part change gets there: ${s.unreachableReason}.`);
    if (!s.changed) throw new ConflictError(`${s.part} is already the nearest ${s.series} value for the target; no change to plan.`);
    const current = build.asBuilt[s.part]?.valueSi;
    if (current === undefined || Math.abs(current - s.fromSi) > 1e-9 * Math.abs(s.fromSi)) {
      throw new ConflictError(`${s.part} changed since the latest analysed run; log a capture of the build as it is now before planning a retune.`);
    }
    const existing = (await listTweaks(input.buildId, trx)).find((t) => t.planned && t.partRef === s.part && t.toValue !== null && Math.abs(t.toValue - s.toSi) <= 1e-9 * Math.abs(s.toSi));
    if (existing) return { tweak: existing, created: false };
    const note =
      `Planned from the retune suggestion on run ${retune.run.originalFilename}: ${s.part} ${valueText(s.fromSi, s.unit)} → ${valueText(s.toSi, s.unit)} (${s.series}), ` +
      `predicted ${formatEngineering(s.predictedHz, "Hz", 6)} for the ${formatEngineering(s.targetHz, "Hz", 6)} target ` +
      `(worst case ${formatEngineering(s.worstCase.minHz, "Hz", 5)} to ${formatEngineering(s.worstCase.maxHz, "Hz", 5)}).` +
      (s.startupWarning ? ` Start-up: ${s.startupWarning}.` : "") +
      (retune.trustWarnings.length > 0 ? ` The run carries trust warnings: ${retune.trustWarnings.join(" ")}` : "");
    const tweak = await createTweak({ buildId: input.buildId, partRef: s.part, fromValue: s.fromSi, toValue: s.toSi, note, planned: true, createdBy: user.id }, trx);
    await recordAudit(
      {
        actorId: user.id,
        action: "tweak.planned",
        entityType: "build",
        entityId: input.buildId,
        detail: { tweakId: tweak.id, part: s.part, fromSi: s.fromSi, toSi: s.toSi, series: s.series, runId: retune.run.id, predictedHz: s.predictedHz },
        ip: meta.ip,
      },
      trx,
    );
    return { tweak, created: true };
  });
}
