// `npm run bench:web` (tsx scripts/bench/web.ts [--duration 5] [--warmup 3] [--pairs 3] [--connections 32]
// [--single 4] [--uploads 20] [--samples 1000000] [--no-load] [--no-uploads] [--profile]): starts an isolated
// Tankbook stack of its own (PostgreSQL on 54340, fake S3 on 4600, fake SMTP on 2600/2601, `next start` on 3400 from
// .next-bench, one worker), seeds 100 builds × 100 runs, measures the three JSON routes each in interleaved pairs
// with the `/api/health` floor (autocannon on loopback) and the run page once, then times single 1M-sample uploads
// from answer to `done` on the idle stack and 20 concurrent ones to the last result, prints every target beside
// its figure with the load average and the commit, and stops everything it started. `--profile` runs next-server
// under --cpu-prof and prints where its time went. Bounded: about two minutes of load plus the uploads.
import { appUrl, bench } from "./web/config";
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { closeDb, db } from "../../db/index";
import { SESSION_COOKIE_NAME } from "../../lib/auth/lucia";
import { measurePairs, measureRoute, warmUp, type LoadFigures, type LoadOptions, type LoadPair, type RouteLoad } from "./web/load";
import { printProfileSummary } from "./web/profile";
import { commitLine, loadTable, machineLine, singleUploadLines, summarisePairs, targetLines, uploadLines } from "./web/report";
import { BENCH_PASSWORD, seedBenchData, type BenchData } from "./web/seed";
import { BenchServices } from "./web/services";
import { concurrentUploads, singleUploads } from "./web/uploads";
import { intOption } from "./int-option";

const { values: args } = parseArgs({
  options: {
    duration: { type: "string", default: "5" },
    warmup: { type: "string", default: "3" },
    pairs: { type: "string", default: "3" },
    connections: { type: "string", default: "32" },
    single: { type: "string", default: "4" },
    uploads: { type: "string", default: "20" },
    samples: { type: "string", default: "1000000" },
    "no-load": { type: "boolean", default: false },
    "no-uploads": { type: "boolean", default: false },
    profile: { type: "boolean", default: false },
  },
  strict: true,
});

const positiveInt = (name: string, raw: string, max: number) => intOption("bench:web", name, raw, 0, max);

// Bounded on purpose: loopback only, at most a minute per measurement, at most 9 pairs and 64 uploads.
const load: LoadOptions = {
  durationS: Math.max(1, positiveInt("duration", args.duration, 60)),
  warmupS: positiveInt("warmup", args.warmup, 30),
  connections: Math.max(1, positiveInt("connections", args.connections, 256)),
  pairs: Math.max(1, positiveInt("pairs", args.pairs, 9)),
};
const uploadCount = args["no-uploads"] ? 0 : positiveInt("uploads", args.uploads, 64);
const singleCount = args["no-uploads"] ? 0 : positiveInt("single", args.single, 10);
const samples = Math.max(1000, positiveInt("samples", args.samples, 10_000_000));
const profileDir = path.join(bench.dataDir, "profile");

function log(line: string): void {
  process.stdout.write(`[bench:web] ${line}\n`);
}

/** A session cookie for the viewer, through the same JSON sign-in the API offers. */
async function sessionCookie(email: string): Promise<string> {
  const response = await fetch(`${appUrl}/api/v1/session`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ email, password: BENCH_PASSWORD }),
  });
  if (response.status !== 201) throw new Error(`sign-in answered ${response.status}: ${await response.text()}`);
  const cookie = response.headers.getSetCookie().find((c) => c.startsWith(`${SESSION_COOKIE_NAME}=`));
  if (!cookie) throw new Error("sign-in set no session cookie");
  return cookie.split(";")[0];
}

function routes(data: BenchData, cookie: string): { floor: RouteLoad; json: RouteLoad[]; page: RouteLoad } {
  const bearer = { authorization: `Bearer ${data.viewer.token}` };
  return {
    floor: { name: "GET /api/health (floor)", origin: appUrl, paths: ["/api/health"], json: false },
    json: [
      { name: "GET /api/v1/builds/{id}/runs", origin: appUrl, paths: data.buildIds.map((id) => `/api/v1/builds/${id}/runs`), headers: bearer, json: true },
      { name: "GET /api/v1/runs/{id}", origin: appUrl, paths: data.runIds.map((id) => `/api/v1/runs/${id}`), headers: bearer, json: true },
      { name: "GET /api/v1/builds/{id}", origin: appUrl, paths: data.buildIds.map((id) => `/api/v1/builds/${id}`), headers: bearer, json: true },
    ],
    page: { name: "GET /runs/{id} (HTML page)", origin: appUrl, paths: data.runIds.map((id) => `/runs/${id}`), headers: { cookie }, json: false },
  };
}

/** One request per route before the load, so a broken route fails the bench instead of measuring errors. */
async function checkRoutes(list: RouteLoad[]): Promise<void> {
  for (const route of list) {
    const response = await fetch(`${route.origin}${route.paths[0]}`, { headers: route.headers, redirect: "manual" });
    const body = await response.text();
    if (response.status !== 200) throw new Error(`${route.name} answered ${response.status}: ${body.slice(0, 300)}`);
  }
}

/** The routes under load; @returns whether every route target was met */
async function loadPhase(data: BenchData): Promise<boolean> {
  const { floor, json, page } = routes(data, await sessionCookie(data.viewer.email));
  await checkRoutes([floor, ...json, page]);
  log(machineLine(load));
  for (const route of [floor, ...json, page]) await warmUp(route, load);
  const rows: { figures: LoadFigures; floor: LoadFigures | null }[] = [];
  const summaries = [];
  for (const route of json) {
    log(`loading ${route.name} in ${load.pairs} pairs with the floor`);
    const pairs: LoadPair[] = await measurePairs(floor, route, load);
    for (const p of pairs) rows.push({ figures: p.floor, floor: null }, { figures: p.route, floor: p.floor });
    summaries.push(summarisePairs(route.name, pairs));
  }
  log(`loading ${page.name}`);
  const pageFloor = await measureRoute(floor, load);
  rows.push({ figures: pageFloor, floor: null }, { figures: await measureRoute(page, load), floor: pageFloor });
  process.stdout.write(`\n${loadTable(rows)}\n\n`);
  log(`load average after the routes: ${os.loadavg().map((l) => l.toFixed(1)).join(" / ")}`);
  const targets = targetLines(summaries);
  process.stdout.write(`${targets.lines.join("\n")}\n\n`);
  return targets.allMet;
}

/** Single uploads on the idle stack, then the concurrent ones; @returns whether every upload target was met */
async function uploadPhase(data: BenchData): Promise<boolean> {
  let met = true;
  if (singleCount > 0) {
    log(`timing ${singleCount} single uploads of ${samples} samples, one after another`);
    const single = await singleUploads({ origin: appUrl, buildId: data.singleUploadBuildId, token: data.technician.token, count: singleCount, samples, deadlineS: 120 });
    const report = singleUploadLines(single);
    process.stdout.write(`${report.lines.join("\n")}\n\n`);
    met &&= report.met;
  }
  if (uploadCount > 0) {
    log(`sending ${uploadCount} uploads of ${samples} samples at once`);
    const uploads = await concurrentUploads({ origin: appUrl, buildId: data.uploadBuildId, token: data.technician.token, count: uploadCount, samples, deadlineS: 900 });
    // None lost: the build holds exactly one done run per upload, as the database sees it.
    const stored = await db()("runs").where({ build_id: data.uploadBuildId }).select("status");
    const storedDone = stored.filter((r: { status: string }) => r.status === "done").length;
    if (stored.length !== uploadCount || storedDone !== uploads.done) {
      uploads.failures.push(`the build holds ${stored.length} runs (${storedDone} done), expected ${uploadCount}`);
    }
    process.stdout.write(`${uploadLines(uploads).join("\n")}\n\n`);
    met &&= uploads.done === uploadCount && stored.length === uploadCount;
  }
  return met;
}

async function main(): Promise<number> {
  const services = new BenchServices(log);
  let interrupted = false;
  const onSignal = (signal: NodeJS.Signals) => {
    if (interrupted) return;
    interrupted = true;
    log(`${signal}: stopping what the bench started`);
    void services.stopAll().finally(() => process.exit(130));
  };
  process.on("SIGINT", onSignal);
  process.on("SIGTERM", onSignal);
  let profiled = false;
  try {
    services.buildIfStale();
    await services.checkPortsFree();
    services.startPostgres();
    await services.startFakeServices();
    services.migrate();
    const data = await seedBenchData(log);
    log(`one run's stored results ${(data.resultsBytes / 1024).toFixed(1)} KiB, plot ${(data.plotBytes / 1024).toFixed(1)} KiB`);
    await services.startAppAndWorker(args.profile ? { cpuProfileDir: profileDir } : {});
    profiled = args.profile;

    const routesMet = args["no-load"] ? true : await loadPhase(data);
    const uploadsMet = await uploadPhase(data);
    log(`${commitLine()}; ${routesMet && uploadsMet ? "every target met" : "some targets not met (see above)"}`);
    return 0;
  } catch (err) {
    log(`failed: ${err instanceof Error ? err.stack ?? err.message : String(err)}`);
    return 1;
  } finally {
    await closeDb().catch(() => undefined);
    await services.stopAll();
    if (profiled) printProfileSummary(profileDir, log);
  }
}

main().then((code) => process.exit(code));
