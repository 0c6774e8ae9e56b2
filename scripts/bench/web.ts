// `npm run bench:web` (tsx scripts/bench/web.ts [--duration 10] [--warmup 3] [--connections 32] [--uploads 20]
// [--samples 1000000] [--no-uploads]): starts an isolated Tankbook stack of its own (PostgreSQL on 54340, fake S3 on
// 4600, fake SMTP on 2600/2601, `next start` on 3400 from .next-bench, one worker), seeds 100 builds × 100 runs,
// measures four routes side by side with autocannon on loopback, then 20 concurrent 1M-sample uploads, prints the
// figures and stops everything it started. Bounded: about a minute of load plus the uploads' analysis.
import { appUrl } from "./web/config";
import os from "node:os";
import { parseArgs } from "node:util";
import { closeDb, db } from "../../db/index";
import { SESSION_COOKIE_NAME } from "../../lib/auth/lucia";
import { measureRoute, type LoadFigures, type LoadOptions, type RouteLoad } from "./web/load";
import { loadTable, machineLine, targetLines, uploadLines } from "./web/report";
import { BENCH_PASSWORD, seedBenchData, type BenchData } from "./web/seed";
import { BenchServices } from "./web/services";
import { concurrentUploads } from "./web/uploads";

const { values: args } = parseArgs({
  options: {
    duration: { type: "string", default: "10" },
    warmup: { type: "string", default: "3" },
    connections: { type: "string", default: "32" },
    uploads: { type: "string", default: "20" },
    samples: { type: "string", default: "1000000" },
    "no-uploads": { type: "boolean", default: false },
  },
  strict: true,
});

function positiveInt(name: string, raw: string, max: number): number {
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0 || n > max) {
    console.error(`bench:web: --${name} must be an integer 0..${max}; got "${raw}"`);
    process.exit(2);
  }
  return n;
}

// Bounded on purpose: loopback only, at most a minute per route, at most 64 uploads.
const load: LoadOptions = {
  durationS: Math.max(1, positiveInt("duration", args.duration, 60)),
  warmupS: positiveInt("warmup", args.warmup, 30),
  connections: Math.max(1, positiveInt("connections", args.connections, 256)),
};
const uploadCount = args["no-uploads"] ? 0 : positiveInt("uploads", args.uploads, 64);
const samples = Math.max(1000, positiveInt("samples", args.samples, 10_000_000));

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

function routes(data: BenchData, cookie: string): RouteLoad[] {
  const bearer = { authorization: `Bearer ${data.viewer.token}` };
  return [
    { name: "GET /api/health (floor)", origin: appUrl, paths: ["/api/health"], json: false },
    { name: "GET /api/v1/builds/{id}/runs", origin: appUrl, paths: data.buildIds.map((id) => `/api/v1/builds/${id}/runs`), headers: bearer, json: true },
    { name: "GET /api/v1/runs/{id}", origin: appUrl, paths: data.runIds.map((id) => `/api/v1/runs/${id}`), headers: bearer, json: true },
    { name: "GET /runs/{id} (HTML page)", origin: appUrl, paths: data.runIds.map((id) => `/runs/${id}`), headers: { cookie }, json: false },
  ];
}

/** One request per route before the load, so a broken route fails the bench instead of measuring errors. */
async function checkRoutes(list: RouteLoad[]): Promise<void> {
  for (const route of list) {
    const response = await fetch(`${route.origin}${route.paths[0]}`, { headers: route.headers, redirect: "manual" });
    const body = await response.text();
    if (response.status !== 200) throw new Error(`${route.name} answered ${response.status}: ${body.slice(0, 300)}`);
  }
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
  try {
    services.buildIfStale();
    await services.checkPortsFree();
    services.startPostgres();
    await services.startFakeServices();
    services.migrate();
    const data = await seedBenchData(log);
    log(`one run's stored results ${(data.resultsBytes / 1024).toFixed(1)} KiB, plot ${(data.plotBytes / 1024).toFixed(1)} KiB`);
    await services.startAppAndWorker();
    const list = routes(data, await sessionCookie(data.viewer.email));
    await checkRoutes(list);

    log(machineLine(load));
    const figures: LoadFigures[] = [];
    for (const route of list) {
      log(`loading ${route.name}`);
      figures.push(await measureRoute(route, load));
    }
    process.stdout.write(`\n${loadTable(figures)}\n\n`);
    log(`load average after the routes: ${os.loadavg().map((l) => l.toFixed(1)).join(" / ")}`);
    const targets = targetLines(figures);
    process.stdout.write(`${targets.lines.join("\n")}\n\n`);

    let uploadsMet = true;
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
      uploadsMet = uploads.done === uploadCount && stored.length === uploadCount;
    }
    log(targets.allMet && uploadsMet ? "every target met" : "some targets not met (see above)");
    return 0;
  } catch (err) {
    log(`failed: ${err instanceof Error ? err.stack ?? err.message : String(err)}`);
    return 1;
  } finally {
    await closeDb().catch(() => undefined);
    await services.stopAll();
  }
}

main().then((code) => process.exit(code));
