// `npm run bench:runs-list` (node --conditions=react-server --import tsx scripts/bench/runs-list-parts.ts
// [--requests 5000] [--rounds 3] [--concurrency 32]): where a build's runs list (`GET /api/v1/builds/{id}/runs`)
// spends this process's CPU outside the framework. It starts the web benchmark's own PostgreSQL cluster (port
// 54340, a fresh database), seeds the same 100 builds × 100 runs as `bench:web`, then runs each part of the route's
// work `--requests` times, `--concurrency` at a time, in interleaved rounds, and prints the median CPU and wall time
// per request of each: the floor's own `select 1`, the list's statement as SQL text (the driver's decoding of 50
// rows), the same rows as one text column each (the decoding without its per-column part), the knex-built read of
// a signed-in session, the whole lookup behind a bearer token, and the answer's JSON. The differences between
// consecutive lines are what each layer adds. Stops the cluster when done.
import { bench } from "./web/config";
import os from "node:os";
import { parseArgs } from "node:util";
import { closeDb, db } from "../../db/index";
import { runJoinedRead } from "../../db/queries/joined-read";
import { runsListRead } from "../../db/queries/runs-list";
import { runSummaryJson } from "../../lib/logbook/api-json";
import { queryObject } from "../../lib/logbook/http";
import { listBuildRunsForRequest } from "../../lib/logbook/runs";
import { runListQuerySchema } from "../../lib/validations/run";
import { commitLine } from "./web/report";
import { seedBenchData } from "./web/seed";
import { BenchServices } from "./web/services";
import { intOption } from "./int-option";

const { values: args } = parseArgs({
  options: {
    requests: { type: "string", default: "5000" },
    rounds: { type: "string", default: "3" },
    concurrency: { type: "string", default: "32" },
  },
  strict: true,
});

const positiveInt = (name: string, raw: string, max: number) => intOption("bench:runs-list", name, raw, 1, max);

const requests = positiveInt("requests", args.requests, 200_000);
const rounds = positiveInt("rounds", args.rounds, 20);
const concurrency = positiveInt("concurrency", args.concurrency, 256);

function log(line: string): void {
  process.stdout.write(`[bench:runs-list] ${line}\n`);
}

interface Part {
  name: string;
  run: (i: number) => Promise<unknown>;
}

/** CPU and wall µs per request of `requests` calls, `concurrency` in flight, after a tenth as many to warm up. */
async function measure(part: Part): Promise<{ cpuUs: number; wallUs: number }> {
  for (let i = 0; i < Math.ceil(requests / 10); i++) await part.run(i);
  const cpuBefore = process.cpuUsage();
  const started = performance.now();
  let next = 0;
  await Promise.all(
    Array.from({ length: concurrency }, async () => {
      while (next < requests) await part.run(next++);
    }),
  );
  const wallMs = performance.now() - started;
  const cpu = process.cpuUsage(cpuBefore);
  return { cpuUs: (cpu.user + cpu.system) / requests, wallUs: (wallMs * 1000) / requests };
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

async function main(): Promise<number> {
  const services = new BenchServices(log);
  const onSignal = () => void services.stopAll().finally(() => process.exit(130));
  process.on("SIGINT", onSignal);
  process.on("SIGTERM", onSignal);
  try {
    await services.checkPortsFree();
    services.startPostgres();
    services.migrate();
    const data = await seedBenchData(log);
    const headers = { authorization: `Bearer ${data.viewer.token}` };
    const buildAt = (i: number) => data.buildIds[i % data.buildIds.length];
    const filter = runListQuerySchema.parse({});
    // The statement knex builds for a session's read, compiled once, so the driver's share shows on its own.
    const statement = db().select("*").from(runsListRead(buildAt(0), filter).rows(db()).as("d")).toSQL();
    const asText = statement.sql.replace(/^select \* from/, 'select d.id::text as id, row_to_json(d)::text as "row" from');
    const page = (await runJoinedRead(runsListRead(buildAt(0), filter))).page;
    const parts: Part[] = [
      { name: "select 1 (the floor's query)", run: () => db().raw("select 1") },
      { name: "the list's SQL, 50 rows of 26 columns", run: () => db().raw(statement.sql, statement.bindings as readonly string[]) },
      { name: "the same rows, one text column each", run: () => db().raw(asText, statement.bindings as readonly string[]) },
      { name: "knex-built read (a session's)", run: (i) => runJoinedRead(runsListRead(buildAt(i), filter)) },
      {
        name: "the route's lookup (bearer token)",
        run: (i) => {
          const request = new Request(`http://127.0.0.1:${bench.appPort}/api/v1/builds/${buildAt(i)}/runs`, { headers });
          return listBuildRunsForRequest(request, buildAt(i), () => runListQuerySchema.parse(queryObject(request)));
        },
      },
      { name: "the answer's JSON (map + stringify)", run: async () => JSON.stringify({ items: page.items.map(runSummaryJson), nextCursor: page.nextCursor }) },
    ];
    log(`${os.availableParallelism()} cores, Node ${process.version}, load average ${os.loadavg().map((l) => l.toFixed(2)).join(" / ")}, ${commitLine()}`);
    log(`${requests} requests per part, ${concurrency} in flight, ${rounds} interleaved rounds`);
    const figures = parts.map(() => ({ cpu: [] as number[], wall: [] as number[] }));
    for (let round = 0; round < rounds; round++) {
      for (const [k, part] of parts.entries()) {
        const { cpuUs, wallUs } = await measure(part);
        figures[k].cpu.push(cpuUs);
        figures[k].wall.push(wallUs);
      }
    }
    process.stdout.write(`\n${"part".padEnd(40)}${"CPU µs/req".padStart(12)}${"range".padStart(14)}${"wall µs/req".padStart(13)}\n`);
    for (const [k, part] of parts.entries()) {
      const { cpu, wall } = figures[k];
      const range = `${Math.min(...cpu).toFixed(0)}–${Math.max(...cpu).toFixed(0)}`;
      process.stdout.write(`${part.name.padEnd(40)}${median(cpu).toFixed(0).padStart(12)}${range.padStart(14)}${median(wall).toFixed(0).padStart(13)}\n`);
    }
    process.stdout.write("\n");
    log(`load average after: ${os.loadavg().map((l) => l.toFixed(2)).join(" / ")}`);
    return 0;
  } catch (err) {
    log(`failed: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
    return 1;
  } finally {
    await closeDb().catch(() => undefined);
    await services.stopAll();
  }
}

main().then((code) => process.exit(code));
