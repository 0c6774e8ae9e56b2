import "server-only";
import { absoluteUncertaintyHz } from "@/lib/drift-trend/absolute-uncertainty";
import type { Build } from "@/db/queries/builds";
import { getBuildTableRow, type BuildTableRow } from "@/db/queries/dashboard";
import { listBuildFlags, type Flag } from "@/db/queries/flags";
import { getFollowStatus, isFollowingProject, type FollowStatus } from "@/db/queries/follows";
import type { ReviewBasis } from "@/db/queries/reviews";
import { listRunsWithSnapshot, type RunSnapshot } from "@/db/queries/runs";
import { listTweaks, type Tweak } from "@/db/queries/tweaks";
import { tweakLabel } from "@/components/logbook/tweak-label";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import {
  buildTimelineSeries,
  classifyImpliedCapacitanceTrend,
  impliedCapacitanceSign,
  impliedCapacitanceUncertaintyF,
  type ImpliedCapacitanceTrend,
  type TimelineSeries,
} from "@/lib/drift-trend";
import { getRetuneSuggestion, getSignOff, type BuildRetune } from "@/lib/logbook/review";
import { retuneAimFor, type RetuneAimView } from "@/lib/logbook/retune-aim";
import { computeBuildSensitivity, type BuildSensitivity } from "@/lib/logbook/sensitivity";
import { analyseDrift, type DriftAnalysis } from "@/lib/oscillator/drift";
import type { OscillatorDesign, Topology } from "@/lib/oscillator/design";
import type { ESeriesName } from "@/lib/oscillator/e-series";

// Everything the build page's review panels and the build report read, in one place: the analysed runs with their
// snapshots (for the charts' bands), tweaks, flags, follow state, sign-off and retune suggestion.

/** Runs the charts hold at most (newest analysed ones); older runs stay in the runs table and the CSV export. */
export const TIMELINE_RUN_LIMIT = 200;

/** One analysed run's implied extra capacitance, as the trend panel lists it. */
export interface ImpliedRunRow {
  id: string;
  index: number;
  originalFilename: string;
  segment: number;
  impliedF: number | null;
  uncertaintyF: number | null;
  sign: "more" | "less" | "none" | null;
}

export interface BuildReviewData {
  series: TimelineSeries;
  /** Analysed runs the charts leave out (older than the newest {@link TIMELINE_RUN_LIMIT}). */
  runsLeftOut: boolean;
  implied: ImpliedRunRow[];
  trend: ImpliedCapacitanceTrend;
  /** The sentence on what the latest run's sign means (lib/oscillator's own words for that run). */
  latestExplanation: string | null;
  /** Short sentence for the latest run's sign. */
  latestSignPhrase: string | null;
  retune: BuildRetune | null;
  retuneError: string | null;
  /** How the person's retune card aims (their remembered choice) and what it takes as real. */
  retuneAim: RetuneAimView;
  flags: Flag[];
  follow: FollowStatus;
  followsProject: boolean;
  signOff: ReviewBasis | null;
  row: BuildTableRow | null;
  /** Rules the latest analysed run broke (its open or acknowledged flags); empty when it passed. */
  latestFlaggedRules: string[];
  /** The latest analysed run, whose verdict is the build's state; older runs' flags are its history. */
  latestAnalysedRun: { id: string; originalFilename: string; createdAt: Date | string } | null;
  tweaks: Tweak[];
  /** Pushing, temperature coefficient and run-to-run stability across the build's runs (the Sensitivity card). */
  sensitivity: BuildSensitivity;
}

function designOfSnapshot(run: { snapshot: RunSnapshot }): OscillatorDesign {
  const s = run.snapshot;
  return {
    topology: s.topology,
    parts: s.parts,
    ...(s.extraCapacitanceF ? { extraCapacitanceF: s.extraCapacitanceF } : {}),
    ...(s.windings ? { windings: s.windings } : {}),
  };
}

/**
 * Reads a build's review data.
 * @param user - the signed-in person (for the follow state)
 * @param build - the build, already loaded by the page
 * @param topology - its design's topology (to word the tweaks)
 * @param options.series - E-series for the retune suggestion; default E12
 */
export async function loadBuildReview(
  user: CurrentUser,
  build: Build,
  topology: Topology,
  options: { series?: ESeriesName } = {},
): Promise<BuildReviewData> {
  const [page, tweaks, flags, follow, followsProject, signOff, row, sensitivity] = await Promise.all([
    listRunsWithSnapshot(build.id, { status: "done", limit: TIMELINE_RUN_LIMIT }),
    listTweaks(build.id),
    listBuildFlags(build.id),
    getFollowStatus(user.id, build.id),
    isFollowingProject(user.id, build.projectId),
    getSignOff(build.id),
    getBuildTableRow(build.id),
    computeBuildSensitivity(build.id, build.timebasePpm),
  ]);
  // Withdrawn runs stay in the build's run list (marked) but leave the charts, the trend and the build's verdict.
  const runs = page.items.filter((r) => r.withdrawnAt === null);

  let retune: BuildRetune | null = null;
  let retuneError: string | null = null;
  const retuneAim = await retuneAimFor(user, build, topology);
  try {
    retune = await getRetuneSuggestion(build.id, { series: options.series, calibrationCapacitanceF: retuneAim.calibrationCapacitanceF });
  } catch (err) {
    retuneError = err instanceof Error ? err.message : "The retune could not be computed for these values.";
  }

  const series = buildTimelineSeries(
    runs.map((r) => ({
      id: r.id,
      createdAt: new Date(r.createdAt).toISOString(),
      originalFilename: r.originalFilename,
      measuredHz: r.measuredHz,
      // Against the prediction and the target: the absolute figure, with the bench's timebase in it.
      frequencyUncertaintyHz: absoluteUncertaintyHz(r.measuredHz, r.frequencyUncertaintyHz, build.timebasePpm),
      predictedHz: r.snapshot.predictedHz ?? r.predictedHz,
      worstCase: r.snapshot.worstCase,
      statistical: r.snapshot.statistical,
      spec: r.snapshot.spec ?? null,
      thdPercent: r.thdPercent,
      worstHarmonicDbc: r.worstHarmonicDbc,
      verdict: r.verdict,
    })),
    tweaks.map((t) => ({ id: t.id, createdAt: new Date(t.createdAt).toISOString(), partRef: t.partRef, planned: t.planned, text: tweakLabel(t, topology) })),
  );

  const byId = new Map(runs.map((r) => [r.id, r]));
  const implied: ImpliedRunRow[] = series.runs.map((point) => {
    const r = byId.get(point.id)!;
    const impliedF = r.impliedExtraCapacitanceF;
    return {
      id: r.id,
      index: point.index,
      originalFilename: r.originalFilename,
      segment: point.segment,
      impliedF,
      uncertaintyF: impliedCapacitanceUncertaintyF(r.snapshot.cEffF, impliedF, r.measuredHz, r.frequencyUncertaintyHz),
      sign: typeof impliedF === "number" && Number.isFinite(impliedF) ? impliedCapacitanceSign(impliedF).sign : null,
    };
  });
  const trend = classifyImpliedCapacitanceTrend(implied.map((p) => ({ impliedExtraCapacitanceF: p.impliedF, uncertaintyF: p.uncertaintyF, segment: p.segment })));

  const latest = runs[0] ?? null;
  let drift: DriftAnalysis | null = null;
  if (latest?.measuredHz && latest.snapshot.predictedHz) {
    try {
      drift = analyseDrift(designOfSnapshot(latest), latest.measuredHz);
    } catch {
      drift = null;
    }
  }
  const latestImplied = latest?.impliedExtraCapacitanceF ?? drift?.impliedExtraCapacitanceF ?? null;
  const latestFlaggedRules = latest && latest.verdict === "fail" ? [...new Set(flags.filter((f) => f.runId === latest.id).map((f) => f.rule))].sort() : [];

  return {
    series,
    runsLeftOut: page.nextCursor !== null,
    implied,
    trend,
    latestExplanation: drift?.explanation ?? null,
    latestSignPhrase: typeof latestImplied === "number" && Number.isFinite(latestImplied) ? impliedCapacitanceSign(latestImplied).phrase : null,
    retune,
    retuneError,
    retuneAim,
    flags,
    follow,
    followsProject,
    signOff,
    row,
    latestFlaggedRules,
    latestAnalysedRun: latest ? { id: latest.id, originalFilename: latest.originalFilename, createdAt: latest.createdAt } : null,
    tweaks,
    sensitivity,
  };
}
