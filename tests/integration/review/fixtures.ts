// Shared by the alerts and review integration tests: people, a project with one Colpitts design and build made
// straight through db/queries, and runs whose analysis is stored the way the worker stores it (claim, results,
// flags), so the tests decide which rules fail without generating captures.
import { createHash, randomBytes, randomUUID } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import { db } from "@/db/index";
import { createBuild } from "@/db/queries/builds";
import { createDesign } from "@/db/queries/designs";
import { replaceRunFlags, type FlagInput } from "@/db/queries/flags";
import { createProject } from "@/db/queries/projects";
import { claimRun, completeRun, createRun, type RunSnapshot } from "@/db/queries/runs";
import { createUser } from "@/db/queries/users";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import type { Role } from "@/lib/auth/permissions";
import { predictOscillator, worstCaseBand, type OscillatorDesign } from "@/lib/oscillator";
import type { DesignSpec, SpecCheck } from "@/lib/spec/types";

export const META = { ip: "192.0.2.10" }; // RFC 5737 TEST-NET-1

export function tag(): string {
  return randomBytes(4).toString("hex");
}

export async function makePerson(role: Role, label: string = role): Promise<CurrentUser> {
  const email = `${label}-${tag()}@review-tests.test`;
  const user = await createUser({ id: generateIdFromEntropySize(10), email, name: `Test ${label}`, role, passwordHash: null });
  return { id: user.id, email, name: user.name, role };
}

/** Colpitts, L 10 µH ±5 %, C1 = C2 = 1 nF ±5 %: C_eff 0.5 nF, f0 = 1/(2π√(10 µH·0.5 nF)) ≈ 2.2508 MHz. */
export const COLPITTS: OscillatorDesign = {
  topology: "colpitts",
  parts: { L: { valueSi: 10e-6, tolerance: 0.05 }, C1: { valueSi: 1e-9, tolerance: 0.05 }, C2: { valueSi: 1e-9, tolerance: 0.05 } },
};

export const SPEC: DesignSpec = { targetHz: 2_000_000, toleranceValue: 0.5, toleranceUnit: "percent", maxHarmonicDbc: -40, maxThdPercent: 2 };

export interface BuildFixture {
  projectId: string;
  designId: string;
  revisionId: string;
  buildId: string;
  label: string;
  snapshot: RunSnapshot;
}

export async function makeBuild(input: { owner: CurrentUser; builtBy?: CurrentUser; label?: string; projectId?: string }): Promise<BuildFixture> {
  const t = tag();
  const projectId = input.projectId ?? (await createProject({ name: `Review tests ${t}`, purpose: "", ownerId: input.owner.id })).id;
  const design = await createDesign({
    projectId,
    name: `Colpitts ${t}`,
    topology: "colpitts",
    parts: COLPITTS.parts,
    extraCapacitanceF: null,
    windings: null,
    spec: SPEC,
    changeNote: "",
    createdBy: input.owner.id,
  });
  const label = input.label ?? `BB-${t}`;
  const build = await createBuild({
    designId: design.id,
    designRevisionId: design.revision.id,
    label,
    kind: "breadboard",
    kindRevision: "",
    builtBy: (input.builtBy ?? input.owner).id,
    asBuilt: COLPITTS.parts,
    createdBy: input.owner.id,
  });
  const prediction = predictOscillator(COLPITTS);
  const band = worstCaseBand(COLPITTS);
  const snapshot: RunSnapshot = {
    topology: "colpitts",
    designId: design.id,
    designRevisionId: design.revision.id,
    designRevision: 1,
    parts: COLPITTS.parts,
    extraCapacitanceF: null,
    windings: null,
    predictedHz: prediction.predictedHz,
    lEffH: prediction.lEffH,
    cEffF: prediction.cEffF,
    worstCase: { minHz: band.minHz, maxHz: band.maxHz },
    statistical: null,
    spec: SPEC,
  };
  return { projectId, designId: design.id, revisionId: design.revision.id, buildId: build.id, label, snapshot };
}

let clock = Date.UTC(2026, 11, 1, 8, 0, 0);

/** Logs a run (queued) with a back-dated, strictly increasing upload time so "latest" is unambiguous. */
export async function logRun(fx: BuildFixture, by: CurrentUser, filename = `capture-${tag()}.csv`): Promise<string> {
  const id = randomUUID();
  clock += 60_000;
  await createRun({
    id,
    buildId: fx.buildId,
    designRevisionId: fx.revisionId,
    tweakId: null,
    objectKey: `tests/review/${id}.csv`,
    sha256: createHash("sha256").update(id).digest("hex"),
    sizeBytes: 1234,
    originalFilename: filename,
    channel: "Out",
    probeAttenuation: 10,
    supplyV: 9,
    temperatureC: 23.5,
    note: "",
    snapshot: fx.snapshot,
    duplicateOfRunId: null,
    createdBy: by.id,
    createdAt: new Date(clock),
  });
  return id;
}

/** A failing check of one rule, with the worker's field names. */
export function failing(rule: string, measured = -35, limit = -40): FlagInput {
  return { rule, measured, limit, margin: limit - measured, unit: rule.startsWith("harmonic") ? "dBc" : "%", message: `${rule} at ${measured} against ${limit}: outside.` };
}

/**
 * Stores an analysis outcome as the worker does: claims the run, writes results and checks, replaces its flags.
 * @param flags - the rules that fail (none: the run passes)
 */
export async function finishRun(
  fx: BuildFixture,
  runId: string,
  flags: FlagInput[],
  numbers: { measuredHz?: number; thdPercent?: number; worstHarmonicDbc?: number; driftPpm?: number } = {},
): Promise<void> {
  const measuredHz = numbers.measuredHz ?? 2_010_000;
  const checks: SpecCheck[] = [
    { rule: "frequency", passed: !flags.some((f) => f.rule === "frequency"), measured: 0.5, limit: 0.5, margin: 0, unit: "%", message: "frequency" },
    ...flags.filter((f) => f.rule !== "frequency").map((f) => ({ ...f, passed: false })),
  ];
  await db().transaction(async (trx) => {
    const attempt = (await claimRun(runId, trx))!;
    const ok = await completeRun(
      runId,
      attempt,
      {
        engineVersion: "test",
        results: { frequencyHz: measuredHz },
        plot: {},
        measuredHz,
        frequencyUncertaintyHz: 0.8,
        driftPpm: numbers.driftPpm ?? ((measuredHz - fx.snapshot.predictedHz!) / fx.snapshot.predictedHz!) * 1e6,
        impliedExtraCapacitanceF: -1.2e-12,
        fundamentalVpk: 1.5,
        thdPercent: numbers.thdPercent ?? 1.1,
        worstHarmonicDbc: numbers.worstHarmonicDbc ?? -42.5,
        inRecordDriftPpm: null,
        specChecks: checks,
        verdict: flags.length > 0 ? "fail" : "pass",
      },
      trx,
    );
    if (!ok) throw new Error(`run ${runId} was not stored`);
    await replaceRunFlags(runId, fx.buildId, flags, trx);
  });
}

/** Audit rows of one action on one entity, oldest first. */
export async function auditFor(action: string, entityId: string): Promise<{ actor_id: string | null; detail: Record<string, unknown>; ip: string | null }[]> {
  return db()("audit_events").where({ action, entity_id: entityId }).orderBy("id").select("actor_id", "detail", "ip");
}
