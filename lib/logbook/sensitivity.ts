import type { Knex } from "knex";
import { db } from "@/db/index";
import { getBuild as getBuildRow } from "@/db/queries/builds";
import { listSensitivityRuns, type SensitivityRunRow } from "@/db/queries/sensitivity";
import { listTweaks } from "@/db/queries/tweaks";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { requirePermission } from "@/lib/auth/require-permission";
import { NotFoundError } from "@/lib/errors";
import type { OscillatorDesign } from "@/lib/oscillator/design";
import { analyseSensitivity, type SensitivityReport, type SensitivityRunInput, type SlopeFigure } from "@/lib/sensitivity";
import type { BuildSensitivityMeasurements, BuildSlopeMeasurement } from "@/lib/spec/types";
import { isId } from "./context";

// Pushing, temperature coefficient and run-to-run stability across a build's runs: the service behind the build
// page's Sensitivity card, the report, GET /api/v1/builds/{id}/sensitivity and the build-level spec rules.

/** A build's across-runs figures. */
export interface BuildSensitivity extends SensitivityReport {
  buildId: string;
}

function designOf(row: SensitivityRunRow): OscillatorDesign | null {
  if (!row.topology || !row.parts) return null;
  return {
    topology: row.topology,
    parts: row.parts,
    ...(row.extraCapacitanceF ? { extraCapacitanceF: row.extraCapacitanceF } : {}),
    ...(row.windings ? { windings: row.windings } : {}),
  };
}

/**
 * The figures for a build whose existence and timebase the caller already knows (the analysis job, which has
 * checked nothing about a person; the page, which loaded the build). No permission check: callers make it.
 */
export async function computeBuildSensitivity(buildId: string, timebasePpm: number | null, trx: Knex | Knex.Transaction = db()): Promise<BuildSensitivity> {
  const [runs, tweaks] = await Promise.all([listSensitivityRuns(buildId, trx), listTweaks(buildId, trx)]);
  const report = analyseSensitivity(
    runs.map((r) => ({ ...r, design: designOf(r) })),
    tweaks.map((t) => ({ id: t.id, createdAt: t.createdAt, partRef: t.partRef, planned: t.planned })),
    { timebasePpm },
  );
  return { buildId, ...report };
}

/**
 * A build's pushing, temperature coefficient and run-to-run stability (any signed-in role may read them).
 * @throws UnauthorizedError, ForbiddenError (role), NotFoundError (build)
 */
export async function getBuildSensitivity(user: CurrentUser | null, buildId: string): Promise<BuildSensitivity> {
  requirePermission(user, "read");
  const build = isId(buildId) ? await getBuildRow(buildId) : null;
  if (!build) throw new NotFoundError("The build");
  return computeBuildSensitivity(build.id, build.timebasePpm);
}

/** The run being analysed, as the across-runs figures take it (its row is not "done" until the result is stored). */
export type AnalysedRunInput = SensitivityRunInput;

/**
 * The build-level spec rules' view of the build as it stands, with `run` (the one just analysed) included in place
 * of any stored copy: pushing and temperature coefficient of the current build state.
 */
export async function buildSensitivityForSpec(buildId: string, timebasePpm: number | null, run: AnalysedRunInput, trx: Knex | Knex.Transaction = db()): Promise<BuildSensitivityMeasurements> {
  const [rows, tweaks] = await Promise.all([listSensitivityRuns(buildId, trx), listTweaks(buildId, trx)]);
  const runs: SensitivityRunInput[] = [...rows.filter((r) => r.id !== run.id).map((r) => ({ ...r, design: designOf(r) })), run];
  const report = analyseSensitivity(
    runs,
    tweaks.map((t) => ({ id: t.id, createdAt: t.createdAt, partRef: t.partRef, planned: t.planned })),
    { timebasePpm },
  );
  // The state the run belongs to is the one judged: a re-analysis of an old run is judged against its own state.
  const group = report.groups.find((g) => g.runIds.includes(run.id));
  const slope = (figure: SlopeFigure | undefined): BuildSlopeMeasurement => {
    if (!group || !figure) {
      const excluded = report.excluded.find((e) => e.runId === run.id);
      return { measured: false, reason: excluded ? `this run is left out of the build's figures: ${excluded.reason}` : "no build state holds this run" };
    }
    if (!figure.measured || figure.ppm === null || figure.ppmSigma === null) return { measured: false, reason: figure.measured ? "no relative slope" : figure.reason };
    return { measured: true, ppm: figure.ppm, ppmSigma: figure.ppmSigma, runs: figure.runs };
  };
  return { pushing: slope(group?.pushing), tempco: slope(group?.tempco) };
}
