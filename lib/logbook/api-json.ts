import type { Build, BuildSummary } from "@/db/queries/builds";
import type { Design, DesignRevision } from "@/db/queries/designs";
import type { Flag } from "@/db/queries/flags";
import type { Project, ProjectSummary } from "@/db/queries/projects";
import type { Run, RunSummary } from "@/db/queries/runs";
import type { Tweak } from "@/db/queries/tweaks";
import type { DriftAnalysis } from "@/lib/oscillator";
import type { Prediction } from "./prediction";

// The /api/v1 JSON shapes: camelCase, SI units in the names, times as ISO 8601 UTC (Date.toJSON does that).
// Internal fields (object keys, attempt counters) stay out.

export function projectJson(p: Project | ProjectSummary) {
  return {
    id: p.id,
    name: p.name,
    purpose: p.purpose,
    ownerId: p.ownerId,
    ownerName: p.ownerName,
    createdAt: p.createdAt,
    updatedAt: p.updatedAt,
    ...("designCount" in p ? { designCount: p.designCount, buildCount: p.buildCount, runCount: p.runCount, lastRunAt: p.lastRunAt } : {}),
  };
}

export function revisionJson(r: DesignRevision) {
  return {
    id: r.id,
    revision: r.revision,
    parts: r.parts,
    extraCapacitanceF: r.extraCapacitanceF,
    windings: r.windings,
    spec: r.spec,
    changeNote: r.changeNote,
    createdBy: r.createdBy,
    createdByName: r.createdByName,
    createdAt: r.createdAt,
  };
}

export function designJson(d: Design, prediction?: Prediction | null) {
  return {
    id: d.id,
    projectId: d.projectId,
    projectName: d.projectName,
    name: d.name,
    topology: d.topology,
    revision: d.currentRevision,
    parts: d.revision.parts,
    extraCapacitanceF: d.revision.extraCapacitanceF,
    windings: d.revision.windings,
    spec: d.revision.spec,
    createdAt: d.createdAt,
    updatedAt: d.updatedAt,
    ...(prediction !== undefined ? { prediction } : {}),
    ...("buildCount" in d ? { buildCount: (d as Design & { buildCount: number }).buildCount } : {}),
  };
}

export function buildJson(b: Build | BuildSummary, prediction?: Prediction | null) {
  return {
    id: b.id,
    designId: b.designId,
    designName: b.designName,
    projectId: b.projectId,
    label: b.label,
    kind: b.kind,
    kindRevision: b.kindRevision,
    builtBy: b.builtBy,
    builtByName: b.builtByName,
    asBuilt: b.asBuilt,
    status: b.status,
    timebasePpm: b.timebasePpm,
    reviewComment: b.reviewComment,
    reviewedByName: b.reviewedByName,
    reviewedAt: b.reviewedAt,
    createdAt: b.createdAt,
    updatedAt: b.updatedAt,
    ...("runCount" in b ? { runCount: b.runCount, latestRun: b.latestRun } : {}),
    ...(prediction !== undefined ? { prediction } : {}),
  };
}

export function tweakJson(t: Tweak) {
  return {
    id: t.id,
    buildId: t.buildId,
    partRef: t.partRef,
    fromValue: t.fromValue,
    toValue: t.toValue,
    note: t.note,
    planned: t.planned,
    createdBy: t.createdBy,
    createdByName: t.createdByName,
    createdAt: t.createdAt,
  };
}

export function flagJson(f: Flag) {
  return {
    id: f.id,
    rule: f.rule,
    measured: f.measured,
    limit: f.limit,
    margin: f.margin,
    unit: f.unit,
    message: f.message,
    acknowledgedAt: f.acknowledgedAt,
    acknowledgedByName: f.acknowledgedByName,
  };
}

export function runSummaryJson(r: RunSummary) {
  return {
    id: r.id,
    buildId: r.buildId,
    status: r.status,
    createdAt: r.createdAt,
    finishedAt: r.finishedAt,
    createdByName: r.createdByName,
    originalFilename: r.originalFilename,
    sizeBytes: r.sizeBytes,
    channel: r.channel,
    tweakId: r.tweakId,
    predictedHz: r.predictedHz,
    measuredHz: r.measuredHz,
    frequencyUncertaintyHz: r.frequencyUncertaintyHz,
    driftPpm: r.driftPpm,
    impliedExtraCapacitanceF: r.impliedExtraCapacitanceF,
    fundamentalVpk: r.fundamentalVpk,
    thdPercent: r.thdPercent,
    worstHarmonicDbc: r.worstHarmonicDbc,
    verdict: r.verdict,
    error: r.error,
    duplicateOfRunId: r.duplicateOfRunId,
    withdrawal: r.withdrawnAt ? { withdrawnAt: r.withdrawnAt, withdrawnBy: r.withdrawnBy, reason: r.withdrawalReason } : null,
  };
}

/**
 * A run for `GET /api/v1/runs/{id}`: at least `{id, buildId, status, createdAt, results, predictedHz, driftPpm,
 * impliedExtraCapacitanceF, verdict, flags, error}`, where `results` is exactly what `analyze --json` prints
 * (null until done); plus the metadata, snapshot, every spec check and the drift explained.
 */
export function runJson(r: Run, flags: Flag[], drift: DriftAnalysis | null) {
  return {
    ...runSummaryJson(r),
    updatedAt: r.updatedAt,
    startedAt: r.startedAt,
    sha256: r.sha256,
    probeAttenuation: r.probeAttenuation,
    supplyV: r.supplyV,
    temperatureC: r.temperatureC,
    note: r.note,
    designRevisionId: r.designRevisionId,
    snapshot: r.snapshot,
    engineVersion: r.engineVersion,
    inRecordDriftPpm: r.inRecordDriftPpm,
    results: r.status === "done" ? r.results : null,
    checks: r.specChecks ?? [],
    flags: flags.map(flagJson),
    drift,
  };
}
