// Builds made straight through db/queries with analysed runs stored as the worker stores them (claim, results,
// columns), so each test decides the implied capacitance, the warnings and where the tweaks fall. Every build is a
// PCB with a revision of its own, so other tests' builds in the shared database never join its group.
import { createHash, randomBytes, randomUUID } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import { db } from "@/db/index";
import { createBuild } from "@/db/queries/builds";
import { createDesign } from "@/db/queries/designs";
import { createProject } from "@/db/queries/projects";
import { claimRun, completeRun, createRun, type RunSnapshot } from "@/db/queries/runs";
import { createTweak } from "@/db/queries/tweaks";
import { createUser } from "@/db/queries/users";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import type { Role } from "@/lib/auth/permissions";
import { predictOscillator, type OscillatorDesign, type Topology } from "@/lib/oscillator";

export const pF = 1e-12;

export function tag(): string {
  return randomBytes(4).toString("hex");
}

export async function makePerson(role: Role, label: string = role): Promise<CurrentUser> {
  const email = `${label}-${tag()}@layouts-tests.test`;
  const user = await createUser({ id: generateIdFromEntropySize(10), email, name: `Test ${label}`, role, passwordHash: null });
  return { id: user.id, email, name: user.name, role };
}

/** Bare tank, L 10 µH, C 1 nF: f0 = 1/(2π√(10 µH · 1 nF)) ≈ 1.59155 MHz (common practice: the LC resonance). */
export const TANK: OscillatorDesign = { topology: "tank", parts: { L: { valueSi: 10e-6, tolerance: 0.05 }, C: { valueSi: 1e-9, tolerance: 0.05 } } };

/** The frequency at which a tank with L and C_eff plus `extraF` resonates: 1/(2π√(L·(C_eff + C_x))). */
export function frequencyWithExtra(lH: number, cEffF: number, extraF: number): number {
  return 1 / (2 * Math.PI * Math.sqrt(lH * (cEffF + extraF)));
}

export interface LayoutBuildFixture {
  projectId: string;
  designId: string;
  revisionId: string;
  buildId: string;
  label: string;
  snapshot: RunSnapshot;
}

export async function makeDesign(owner: CurrentUser, design: OscillatorDesign = TANK, topology: Topology = design.topology) {
  const t = tag();
  const project = await createProject({ name: `Layout tests ${t}`, purpose: "", ownerId: owner.id });
  return createDesign({
    projectId: project.id,
    name: `Tank ${t}`,
    topology,
    parts: design.parts,
    extraCapacitanceF: null,
    windings: null,
    spec: {},
    changeNote: "",
    createdBy: owner.id,
  });
}

export async function makeLayoutBuild(input: {
  owner: CurrentUser;
  design: Awaited<ReturnType<typeof makeDesign>>;
  kind?: "breadboard" | "perfboard" | "pcb" | "other";
  revision: string;
  label?: string;
}): Promise<LayoutBuildFixture> {
  const label = input.label ?? `B-${tag()}`;
  const build = await createBuild({
    designId: input.design.id,
    designRevisionId: input.design.revision.id,
    label,
    kind: input.kind ?? "pcb",
    kindRevision: input.revision,
    builtBy: input.owner.id,
    asBuilt: input.design.revision.parts,
    createdBy: input.owner.id,
  });
  const prediction = predictOscillator({ topology: input.design.topology, parts: input.design.revision.parts });
  const snapshot: RunSnapshot = {
    topology: input.design.topology,
    designId: input.design.id,
    designRevisionId: input.design.revision.id,
    designRevision: 1,
    parts: input.design.revision.parts,
    extraCapacitanceF: null,
    windings: null,
    predictedHz: prediction.predictedHz,
    lEffH: prediction.lEffH,
    cEffF: prediction.cEffF,
    worstCase: null,
    statistical: null,
    spec: {},
  };
  return { projectId: input.design.projectId, designId: input.design.id, revisionId: input.design.revision.id, buildId: build.id, label, snapshot };
}

let clock = Date.UTC(2026, 10, 1, 8, 0, 0);

/** Next strictly increasing back-dated moment, one minute on. */
export function tick(): Date {
  clock += 60_000;
  return new Date(clock);
}

/** An applied note-only tweak now (it starts a new segment for the runs after it). */
export async function logTweak(fx: LayoutBuildFixture, by: CurrentUser, planned = false): Promise<void> {
  await createTweak({ buildId: fx.buildId, partRef: null, fromValue: null, toValue: null, note: "moved the leads", planned, createdBy: by.id, createdAt: tick() });
}

/**
 * Logs and analyses a run whose measured frequency implies `impliedF` of extra capacitance.
 * @param warnings - trust warning codes the analysis raised (none: a trusted run)
 */
export async function logAnalysedRun(
  fx: LayoutBuildFixture,
  by: CurrentUser,
  impliedF: number,
  options: { warnings?: string[]; thdPercent?: number; verdict?: "pass" | "fail" } = {},
): Promise<string> {
  const id = randomUUID();
  await createRun({
    id,
    buildId: fx.buildId,
    designRevisionId: fx.revisionId,
    tweakId: null,
    objectKey: `tests/layouts/${id}.csv`,
    sha256: createHash("sha256").update(id).digest("hex"),
    sizeBytes: 1234,
    originalFilename: `capture-${tag()}.csv`,
    channel: "Out",
    probeAttenuation: 10,
    supplyV: 9,
    temperatureC: 23.5,
    note: "",
    snapshot: fx.snapshot,
    duplicateOfRunId: null,
    createdBy: by.id,
    createdAt: tick(),
  });
  const measuredHz = frequencyWithExtra(fx.snapshot.lEffH!, fx.snapshot.cEffF!, impliedF);
  const warnings = (options.warnings ?? []).map((code) => ({ code, message: `${code} in this record` }));
  await db().transaction(async (trx) => {
    const attempt = (await claimRun(id, trx))!;
    const ok = await completeRun(
      id,
      attempt,
      {
        engineVersion: "test",
        results: { frequencyHz: measuredHz, warnings, harmonics: [{ order: 2, dBc: -45 }, { order: 3, dBc: -52 }] },
        plot: {},
        measuredHz,
        frequencyUncertaintyHz: 0.5,
        driftPpm: ((measuredHz - fx.snapshot.predictedHz!) / fx.snapshot.predictedHz!) * 1e6,
        impliedExtraCapacitanceF: impliedF,
        fundamentalVpk: 1.5,
        thdPercent: options.thdPercent ?? 0.8,
        worstHarmonicDbc: -45,
        inRecordDriftPpm: null,
        specChecks: [],
        verdict: options.verdict ?? null,
      },
      trx,
    );
    if (!ok) throw new Error(`run ${id} was not stored`);
  });
  return id;
}

/** Runs at the given implied values (pF), with a tweak between the segments: [[12, 12.2], [12.4]] is two segments. */
export async function logSegments(fx: LayoutBuildFixture, by: CurrentUser, segments: number[][]): Promise<void> {
  for (const [i, values] of segments.entries()) {
    if (i > 0) await logTweak(fx, by);
    for (const v of values) await logAnalysedRun(fx, by, v * pF);
  }
}
