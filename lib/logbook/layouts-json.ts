import type { ComparedBuild } from "@/lib/layouts/build-comparison";
import type { LayoutFigure } from "@/lib/layouts/layout-figures";
import type { CalibratedView } from "./layouts";

// The /api/v1 JSON shapes of the lab's figures, the calibrated prediction and the build comparison: camelCase,
// SI units in the names, times as ISO 8601 UTC.

export function layoutFigureJson(f: LayoutFigure) {
  return {
    construction: { key: f.constructionKey, name: f.constructionName, kind: f.construction.kind, revision: f.construction.revision },
    topology: f.topology,
    strength: f.strength,
    candidateBuildCount: f.candidateBuildCount,
    capacitanceF: f.capacitanceF,
    inductanceErrorFraction: f.inductanceErrorFraction,
    builds: f.builds,
  };
}

export function calibratedViewJson(designId: string, v: CalibratedView) {
  const p = v.prediction;
  return {
    designId,
    construction: { key: v.constructionKey, name: v.constructionName, kind: v.construction.kind, revision: v.construction.revision },
    asDesigned: p?.asDesigned ?? null,
    asBuilt: p?.asBuilt ?? null,
    labCapacitanceF: p?.labCapacitanceF ?? null,
    labSpreadF: p?.labSpreadF ?? null,
    shiftHz: p?.shiftHz ?? null,
    figure: v.figure
      ? { strength: v.figure.strength, buildCount: v.figure.capacitanceF.count, buildIds: v.figure.builds.map((b) => b.buildId) }
      : null,
    error: v.error,
    choices: v.choices,
  };
}

export function comparedBuildJson(c: ComparedBuild) {
  const r = c.latestRun;
  return {
    build: {
      id: c.build.id,
      label: c.build.label,
      kind: c.build.kind,
      kindRevision: c.build.kindRevision,
      status: c.build.status,
      designId: c.build.designId,
      designName: c.build.designName,
      topology: c.build.topology,
      projectId: c.build.projectId,
      projectName: c.build.projectName,
    },
    construction: { key: c.constructionKey, name: c.constructionName },
    runCount: c.runCount,
    latestRun: r
      ? {
          id: r.id,
          createdAt: r.createdAt,
          originalFilename: r.originalFilename,
          measuredHz: r.measuredHz,
          frequencyUncertaintyHz: r.frequencyUncertaintyHz,
          predictedHz: r.predictedHz,
          worstCase: r.worstCase,
          statistical: r.statistical,
          driftPpm: r.driftPpm,
          impliedExtraCapacitanceF: r.impliedExtraCapacitanceF,
          thdPercent: r.thdPercent,
          worstHarmonicDbc: r.worstHarmonicDbc,
          verdict: r.verdict,
          harmonics: r.harmonics,
          warningCodes: r.warningCodes,
          withdrawnAt: r.withdrawnAt,
          chosen: c.runChosen,
          stability: c.stability,
        }
      : null,
    runChoices: c.runChoices,
    offsetHz: c.offsetHz,
    trend: { verdict: c.trend.verdict, typicalF: c.trend.typicalF, spreadF: c.trend.spreadF, allowanceF: c.trend.allowanceF, summary: c.trend.summary },
  };
}
