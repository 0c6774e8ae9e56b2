/**
 * Several builds side by side: each one's compared run (chosen, else the newest that is not withdrawn) against its
 * prediction, with its stability figures where the engine measured them, and its implied-capacitance trend read
 * exactly as its build page reads it (segments between applied tweaks, lib/drift-trend's classifier; withdrawn runs
 * left out). Pure: no I/O.
 */
import type { CompareBuildRow, CompareLatestRun, CompareRows, CompareTrendRun } from "@/db/queries/layouts";
import {
  buildTimelineSeries,
  classifyImpliedCapacitanceTrend,
  impliedCapacitanceUncertaintyF,
  type ImpliedCapacitanceTrend,
} from "@/lib/drift-trend";
import { constructionKey, constructionName, constructionOf } from "./construction";

/** A run the comparison can show for a build, newest first. */
export interface CompareRunChoice {
  id: string;
  createdAt: Date;
  originalFilename: string;
  withdrawn: boolean;
}

/** One point of a phase-noise estimate; `atFloor` means the capture's noise floor, an upper bound only. */
export interface PhaseNoisePoint {
  offsetHz: number;
  dbcPerHz: number;
  atFloor: boolean;
}

/** The stability figures of the compared run, or why there are none. */
export interface CompareStability {
  /** False when the run's analysis holds no stability figures at all (analysed before the engine measured them). */
  measured: boolean;
  /** Why a figure is missing, in the engine's words or ours. */
  reason: string | null;
  rmsJitterS: number | null;
  /** Why the jitter is missing, when the engine said. */
  jitterReason: string | null;
  phaseNoise: PhaseNoisePoint[];
  allan: { tauS: number; adev: number }[];
}

export interface ComparedBuild {
  build: CompareBuildRow;
  constructionKey: string;
  constructionName: string;
  /** Analysed runs of the build that count (withdrawn ones left out). */
  runCount: number;
  /** The compared run: the one chosen, else the newest analysed run that is not withdrawn. */
  latestRun: CompareLatestRun | null;
  /** True when `latestRun` was chosen rather than the default. */
  runChosen: boolean;
  /** Every analysed run of the build, newest first, withdrawn ones marked: what the run picker offers. */
  runChoices: CompareRunChoice[];
  stability: CompareStability;
  /** measured − predicted of the latest run, Hz; null without both. */
  offsetHz: number | null;
  trend: ImpliedCapacitanceTrend;
}

/** Most builds one comparison takes: more do not fit side by side on a page or a chart legend. */
export const MAX_COMPARED_BUILDS = 8;

const NOT_MEASURED = "not measured: this run was analysed before the engine measured stability; re-analyse it to get the figures";

const finite = (v: unknown): v is number => typeof v === "number" && Number.isFinite(v);
const record = (v: unknown): Record<string, unknown> | null => (v && typeof v === "object" && !Array.isArray(v) ? (v as Record<string, unknown>) : null);
const points = (v: unknown): Record<string, unknown>[] => {
  const list = record(v)?.points;
  return Array.isArray(list) ? list.map(record).filter((p): p is Record<string, unknown> => p !== null) : [];
};

/**
 * Reads the stability figures an analysis stored (results.stability: jitter, phase noise, Allan deviation),
 * keeping only well-formed finite points. Absent figures say so with a reason, never as 0.
 */
export function readCompareStability(stored: unknown): CompareStability {
  const s = record(stored);
  if (!s) return { measured: false, reason: NOT_MEASURED, rmsJitterS: null, jitterReason: null, phaseNoise: [], allan: [] };
  const jitter = record(s.jitter);
  const rms = jitter?.rmsJitterS;
  const rmsJitterS = finite(rms) && rms >= 0 ? rms : null;
  const phaseNoise = points(s.phaseNoise)
    .filter((p) => finite(p.offsetHz) && (p.offsetHz as number) > 0 && finite(p.dbcPerHz))
    .map((p) => ({ offsetHz: p.offsetHz as number, dbcPerHz: p.dbcPerHz as number, atFloor: p.atFloor === true }))
    .sort((a, b) => a.offsetHz - b.offsetHz);
  const allan = points(s.allan)
    .filter((p) => finite(p.tauS) && (p.tauS as number) > 0 && finite(p.adev) && (p.adev as number) >= 0)
    .map((p) => ({ tauS: p.tauS as number, adev: p.adev as number }))
    .sort((a, b) => a.tauS - b.tauS);
  const jitterReason = rmsJitterS === null ? (typeof jitter?.reason === "string" && jitter.reason ? jitter.reason : "not measured on this capture") : null;
  return { measured: true, reason: null, rmsJitterS, jitterReason, phaseNoise, allan };
}

/**
 * Why a choice of runs cannot be compared, or null when it can: every chosen run must be an analysed run of one of
 * the compared builds, at most one per build.
 * @param runs - the analysed runs of the compared builds (listCompareRows' trendRuns).
 */
export function chosenRunsProblem(runs: readonly Pick<CompareTrendRun, "id" | "buildId">[], chosenRunIds: readonly string[]): string | null {
  const buildOf = new Map(runs.map((r) => [r.id, r.buildId]));
  const perBuild = new Set<string>();
  for (const id of chosenRunIds) {
    const buildId = buildOf.get(id);
    if (!buildId) return `The run ${id} is not an analysed run of the compared builds.`;
    if (perBuild.has(buildId)) return "Choose at most one run per build.";
    perBuild.add(buildId);
  }
  return null;
}

/**
 * Assembles the comparison in the order asked for.
 * @param rows - from db/queries/layouts' listCompareRows.
 * @param order - build ids in the order to show; ids with no build row are skipped.
 * @param chosenRunIds - runs chosen instead of the default (already checked with {@link chosenRunsProblem}).
 */
export function compareBuilds(rows: CompareRows, order: readonly string[], chosenRunIds: readonly string[] = []): ComparedBuild[] {
  const chosen = new Set(chosenRunIds);
  const byId = new Map(rows.builds.map((b) => [b.id, b]));
  const latestById = new Map(rows.latestRuns.map((r) => [r.buildId, r]));
  const seen = new Set<string>();
  const out: ComparedBuild[] = [];
  for (const id of order) {
    const build = byId.get(id);
    if (!build || seen.has(id)) continue;
    seen.add(id);
    const ofBuild = rows.trendRuns.filter((r) => r.buildId === id);
    // A withdrawn run never enters the trend, chosen or not.
    const runs = ofBuild.filter((r) => !r.withdrawn);
    const tweaks = rows.tweaks.filter((t) => t.buildId === id);
    const series = buildTimelineSeries(
      runs.map((r) => ({
        id: r.id,
        createdAt: r.createdAt,
        originalFilename: "",
        measuredHz: r.measuredHz,
        frequencyUncertaintyHz: r.frequencyUncertaintyHz,
        predictedHz: null,
        worstCase: null,
        statistical: null,
        spec: null,
        thdPercent: null,
        worstHarmonicDbc: null,
        verdict: null,
      })),
      tweaks.map((t) => ({ id: t.id, createdAt: t.createdAt, partRef: t.partRef, planned: t.planned, text: "" })),
    );
    const runById = new Map(runs.map((r) => [r.id, r]));
    const trend = classifyImpliedCapacitanceTrend(
      series.runs.map((point) => {
        const r = runById.get(point.id)!;
        return {
          impliedExtraCapacitanceF: r.impliedExtraCapacitanceF,
          uncertaintyF: impliedCapacitanceUncertaintyF(r.cEffF, r.impliedExtraCapacitanceF, r.measuredHz, r.frequencyUncertaintyHz),
          segment: point.segment,
        };
      }),
    );
    const latest = latestById.get(id) ?? null;
    const construction = constructionOf(build.kind, build.kindRevision);
    out.push({
      build,
      constructionKey: constructionKey(construction),
      constructionName: constructionName(construction),
      runCount: runs.length,
      latestRun: latest,
      runChosen: latest !== null && chosen.has(latest.id),
      runChoices: ofBuild
        .map((r) => ({ id: r.id, createdAt: r.createdAt, originalFilename: r.originalFilename, withdrawn: r.withdrawn }))
        .sort((a, b) => new Date(b.createdAt).getTime() - new Date(a.createdAt).getTime() || (a.id < b.id ? 1 : -1)),
      stability: latest ? readCompareStability(latest.stability) : { measured: false, reason: "no analysed run to read", rmsJitterS: null, jitterReason: null, phaseNoise: [], allan: [] },
      offsetHz: latest && latest.measuredHz !== null && latest.predictedHz !== null ? latest.measuredHz - latest.predictedHz : null,
      trend,
    });
  }
  return out;
}
