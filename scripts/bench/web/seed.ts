// The bench's data: 100 builds × 100 analysed runs, invented. Projects, designs and builds go through the
// logbook services; the 10 000 runs are batch-inserted with the columns the worker would have written, because
// pushing them through the real pipeline would take the better part of an hour. Each run carries a real engine
// result and plot (from one analysed synthetic capture), so run detail serves what it serves in use.
import { randomBytes, randomUUID } from "node:crypto";
import { generateIdFromEntropySize } from "lucia";
import { db } from "../../../db/index";
import { getDesign, type Design } from "../../../db/queries/designs";
import type { Build } from "../../../db/queries/builds";
import { createUser } from "../../../db/queries/users";
import { analyzeCapture, ENGINE_VERSION, importCapture, type AnalysisResult } from "../../../lib/analysis";
import { createApiToken } from "../../../lib/auth/api-tokens";
import { hashPassword } from "../../../lib/auth/password";
import type { CurrentUser } from "../../../lib/auth/current-user-type";
import type { Role } from "../../../lib/auth/permissions";
import { derivedColumns } from "../../../lib/jobs/process-run";
import { createBuild } from "../../../lib/logbook/builds";
import { createDesign } from "../../../lib/logbook/designs";
import { runSnapshot } from "../../../lib/logbook/prediction";
import { createProject } from "../../../lib/logbook/projects";
import { evaluateSpec } from "../../../lib/spec/evaluate";
import { captureObjectKey } from "../../../lib/storage";
import { designInputSchema } from "../../../lib/validations/design";
import { SeededRandom, synthCaptureCsv } from "../../lib/synth-capture";

export const BENCH_PASSWORD = "bench-load-2026";

export interface BenchPerson extends CurrentUser {
  token: string;
}

export interface BenchData {
  viewer: BenchPerson;
  technician: BenchPerson;
  /** Every seeded build id, and one run id per build (the newest). */
  buildIds: string[];
  runIds: string[];
  /** A build kept empty for the concurrent uploads, so its duplicates check stays apart from the seeded runs. */
  uploadBuildId: string;
  /** Another empty build for the single uploads, so the concurrent phase's count of runs stays exact. */
  singleUploadBuildId: string;
  /** Bytes of one run's results and plot JSON as stored. */
  resultsBytes: number;
  plotBytes: number;
}

const DESIGNS = 10;
const BUILDS_PER_DESIGN = 10;
const RUNS_PER_BUILD = 100;
const DAY_MS = 86_400_000;

async function person(role: Role, name: string): Promise<BenchPerson> {
  const user = await createUser({
    id: generateIdFromEntropySize(10),
    email: `${role}@bench.test`,
    name,
    role,
    passwordHash: await hashPassword(BENCH_PASSWORD),
  });
  const { token } = await createApiToken({ userId: user.id, name: "web bench" });
  return { id: user.id, email: user.email, name: user.name, role: user.role, token };
}

/** One analysed capture, as the worker would have stored it: a 100 000-sample record of a 370 kHz Colpitts. */
function referenceAnalysis(): { result: AnalysisResult; plotJson: string } {
  const csv = synthCaptureCsv({
    frequencyHz: 371_200,
    sampleRateHz: 25e6,
    samples: 100_000,
    amplitudeV: 1.1,
    harmonicsDbc: [-34, -43, -51],
    noiseVrms: 0.004,
    quantizationBits: 8,
    fullScaleV: 2,
    seed: 2026,
    preamble: { Instrument: "bench scope 2", "Record Length": "100000" },
  });
  const { result, plot } = analyzeCapture(importCapture(csv));
  return { result, plotJson: JSON.stringify(plot) };
}

function colpitts(index: number) {
  return designInputSchema.parse({
    name: `Colpitts ${370 + index}k`,
    topology: "colpitts",
    parts: { L: { value: "100u", tolerance: "5%" }, C1: { value: "2.2n", tolerance: "5%" }, C2: { value: "4.7n", tolerance: "5%" } },
    spec: { targetHz: "370k", toleranceValue: "2", toleranceUnit: "percent", maxHarmonicDbc: "-35", maxThdPercent: "5" },
  });
}

/**
 * Seeds the bench database (already migrated): a viewer and a technician with API tokens, one project,
 * 10 designs × 10 builds, 100 done runs per build with results, plot, spec checks and flags.
 */
export async function seedBenchData(log: (line: string) => void): Promise<BenchData> {
  const started = Date.now();
  const engineer = await person("engineer", "Bench Engineer");
  const technician = await person("technician", "Bench Technician");
  const viewer = await person("viewer", "Bench Viewer");
  const project = await createProject({ user: engineer }, { name: "Load bench", purpose: "Invented data for npm run bench:web." });

  const builds: { build: Build; design: Design }[] = [];
  for (let d = 0; d < DESIGNS; d++) {
    const created = await createDesign({ user: engineer }, project.id, colpitts(d));
    const design = (await getDesign(created.id))!;
    for (let b = 0; b < BUILDS_PER_DESIGN; b++) {
      const build = await createBuild({ user: technician }, design.id, { label: `PCB-${d}${b}`, kind: "pcb", kindRevision: "rev B" });
      builds.push({ build, design });
    }
  }
  const uploadDesign = await createDesign({ user: engineer }, project.id, colpitts(DESIGNS));
  const uploadBuild = await createBuild({ user: technician }, uploadDesign.id, { label: "UPLOADS", kind: "pcb", kindRevision: "rev B" });
  const singleUploadBuild = await createBuild({ user: technician }, uploadDesign.id, { label: "SINGLE", kind: "pcb", kindRevision: "rev B" });

  const { result, plotJson } = referenceAnalysis();
  const random = new SeededRandom(9);
  const runIds: string[] = [];
  let resultsBytes = 0;
  const now = Date.now();
  for (const { build, design } of builds) {
    const snapshot = runSnapshot(build, design);
    const snapshotJson = JSON.stringify(snapshot);
    const runs: Record<string, unknown>[] = [];
    const flags: Record<string, unknown>[] = [];
    let newest: string | null = null;
    for (let i = 0; i < RUNS_PER_BUILD; i++) {
      const id = randomUUID();
      // About one run in five lands outside the ±2 % band, so lists and detail carry flags as in real use.
      const frequencyHz = 370_000 * (1 + 0.012 * random.normal());
      const runResult = { ...result, frequencyHz };
      const evaluation = evaluateSpec(snapshot.spec ?? {}, {
        frequencyHz,
        thdPercent: runResult.thdPercent,
        harmonics: runResult.harmonics,
        fundamentalVpk: runResult.fundamentalVpk,
        inRecordDriftPpm: null,
        warnings: runResult.warnings,
      });
      const derived = derivedColumns({ snapshot }, { frequencyHz });
      const resultsJson = JSON.stringify(runResult);
      resultsBytes = resultsJson.length;
      const createdAt = new Date(now - (RUNS_PER_BUILD - i) * DAY_MS * 0.9 - Math.floor(random.uniform() * 3600_000));
      const worst = runResult.harmonics.map((h) => h.dBc).filter((v): v is number => v !== null && Number.isFinite(v));
      runs.push({
        id,
        build_id: build.id,
        design_revision_id: design.revision.id,
        object_key: captureObjectKey(id),
        sha256: randomBytes(32).toString("hex"),
        size_bytes: 2_400_000,
        original_filename: `capture-${String(i + 1).padStart(3, "0")}.csv`,
        probe_attenuation: 10,
        supply_v: 9,
        temperature_c: 22 + random.uniform() * 4,
        note: i % 7 === 0 ? "after reflow of C2; probe ground spring" : "",
        snapshot: snapshotJson,
        predicted_hz: snapshot.predictedHz,
        status: "done",
        engine_version: ENGINE_VERSION,
        results: resultsJson,
        measured_hz: frequencyHz,
        frequency_uncertainty_hz: runResult.frequencyUncertaintyHz,
        drift_ppm: derived.driftPpm,
        implied_extra_capacitance_f: derived.impliedExtraCapacitanceF,
        fundamental_vpk: runResult.fundamentalVpk,
        thd_percent: Number.isFinite(runResult.thdPercent) ? runResult.thdPercent : null,
        worst_harmonic_dbc: worst.length ? Math.max(...worst) : null,
        spec_checks: JSON.stringify(evaluation.checks),
        verdict: evaluation.verdict,
        attempts: 1,
        created_by: technician.id,
        created_at: createdAt,
        updated_at: createdAt,
        started_at: createdAt,
        finished_at: new Date(createdAt.getTime() + 1500),
      });
      for (const c of evaluation.checks.filter((check) => !check.passed)) {
        flags.push({ run_id: id, build_id: build.id, rule: c.rule, measured: c.measured, limit: c.limit, margin: c.margin, unit: c.unit, message: c.message, created_at: createdAt });
      }
      newest = id;
    }
    await db().batchInsert("runs", runs, 50);
    if (flags.length) await db().batchInsert("flags", flags, 200);
    runIds.push(newest!);
  }
  // Every run gets the same real plot. Shipping and parsing 216 KiB of JSON 10 000 times took over a minute;
  // copying one stored value inside PostgreSQL reuses its compressed form.
  // (A plain table, not a temporary one: the pool may hand each statement another connection.)
  await db().raw("create table bench_plot (plot jsonb not null)");
  await db().raw("insert into bench_plot (plot) values (?::jsonb)", [plotJson]);
  await db().raw("update runs set plot = (select plot from bench_plot) where status = 'done' and plot is null");
  await db().raw("drop table bench_plot");
  await db().raw("vacuum analyze runs");
  await db().raw("analyze flags");
  log(`seeded ${builds.length} builds × ${RUNS_PER_BUILD} runs in ${((Date.now() - started) / 1000).toFixed(1)} s`);
  return {
    viewer,
    technician,
    buildIds: builds.map((b) => b.build.id),
    runIds,
    uploadBuildId: uploadBuild.id,
    singleUploadBuildId: singleUploadBuild.id,
    resultsBytes,
    plotBytes: plotJson.length,
  };
}
