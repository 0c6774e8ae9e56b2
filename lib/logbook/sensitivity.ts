import type { Knex } from "knex";
import { db } from "@/db/index";
import { getBuild as getBuildRow } from "@/db/queries/builds";
import { listSensitivityRuns, type SensitivityRunRow } from "@/db/queries/sensitivity";
import { listTweaks } from "@/db/queries/tweaks";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { requirePermission } from "@/lib/auth/require-permission";
import { NotFoundError } from "@/lib/errors";
import type { OscillatorDesign } from "@/lib/oscillator/design";
import { analyseSensitivity, type SensitivityReport } from "@/lib/sensitivity";
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
