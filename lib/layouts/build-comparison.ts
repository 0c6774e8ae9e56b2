/**
 * Several builds side by side: each one's newest analysed run against its prediction, and its implied-capacitance
 * trend read exactly as its build page reads it (segments between applied tweaks, lib/drift-trend's classifier).
 * Pure: no I/O.
 */
import type { CompareBuildRow, CompareLatestRun, CompareRows } from "@/db/queries/layouts";
import {
  buildTimelineSeries,
  classifyImpliedCapacitanceTrend,
  impliedCapacitanceUncertaintyF,
  type ImpliedCapacitanceTrend,
} from "@/lib/drift-trend";
import { constructionKey, constructionName, constructionOf } from "./construction";

export interface ComparedBuild {
  build: CompareBuildRow;
  constructionKey: string;
  constructionName: string;
  /** Analysed runs of the build. */
  runCount: number;
  latestRun: CompareLatestRun | null;
  /** measured − predicted of the latest run, Hz; null without both. */
  offsetHz: number | null;
  trend: ImpliedCapacitanceTrend;
}

/** Most builds one comparison takes: more do not fit side by side on a page or a chart legend. */
export const MAX_COMPARED_BUILDS = 8;

/**
 * Assembles the comparison in the order asked for.
 * @param rows - from db/queries/layouts' listCompareRows.
 * @param order - build ids in the order to show; ids with no build row are skipped.
 */
export function compareBuilds(rows: CompareRows, order: readonly string[]): ComparedBuild[] {
  const byId = new Map(rows.builds.map((b) => [b.id, b]));
  const latestById = new Map(rows.latestRuns.map((r) => [r.buildId, r]));
  const seen = new Set<string>();
  const out: ComparedBuild[] = [];
  for (const id of order) {
    const build = byId.get(id);
    if (!build || seen.has(id)) continue;
    seen.add(id);
    const runs = rows.trendRuns.filter((r) => r.buildId === id);
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
      offsetHz: latest && latest.measuredHz !== null && latest.predictedHz !== null ? latest.measuredHz - latest.predictedHz : null,
      trend,
    });
  }
  return out;
}
