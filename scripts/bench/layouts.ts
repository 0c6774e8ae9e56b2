// `npm run bench:layouts` (tsx scripts/bench/layouts.ts [--builds 500] [--runs 20000] [--repeat 20]): starts a
// PostgreSQL cluster of its own (port 54346, data under .data/bench-layouts/pg), a fresh migrated database, fills it
// with invented builds spread over the four kinds and topologies, runs with implied capacitances (some with trust
// warnings) and a tweak between every few runs, then times the lab's aggregate (db/queries/layouts
// listLayoutGroups, one statement) and prints the figures. Stops the cluster at the end.
import os from "node:os";
import path from "node:path";
import { parseArgs } from "node:util";
import { fileURLToPath } from "node:url";
import knex from "knex";
import config from "../../knexfile";
import { closeDb, db } from "../../db/index";
import { migrationSource } from "../../db/migration-source";
import { listLayoutGroups } from "../../db/queries/layouts";
import * as pgLib from "../lib/postgres.mjs";
import { intOption } from "./int-option";

const PORT = 54346;
const DATABASE = "tankbook_bench_layouts";
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../..");

const { values: args } = parseArgs({
  options: { builds: { type: "string", default: "500" }, runs: { type: "string", default: "20000" }, repeat: { type: "string", default: "20" } },
  strict: true,
});

const positiveInt = (name: string, raw: string, max: number) => intOption("bench:layouts", name, raw, 1, max);

const builds = positiveInt("builds", args.builds, 20_000);
const runs = positiveInt("runs", args.runs, 1_000_000);
const repeat = positiveInt("repeat", args.repeat, 1000);

function quantile(sorted: number[], q: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor(q * sorted.length))];
}

async function fill(): Promise<void> {
  const k = db();
  // Set-based inserts: the data are invented, so generate_series makes them in the database in seconds.
  await k.raw(
    `insert into auth_user (id, email, name, role, password_hash) values ('bench-layouts', 'bench-layouts@bench.test', 'Bench', 'engineer', null)`,
  );
  await k.raw(`insert into projects (id, name, purpose, owner_id) values (gen_random_uuid(), 'Bench layouts', '', 'bench-layouts')`);
  await k.raw(`
    insert into designs (id, project_id, name, topology, current_revision, created_by)
    select gen_random_uuid(), (select id from projects where name = 'Bench layouts'), 'Bench design ' || t, t, 1, 'bench-layouts'
    from unnest(array['tank', 'colpitts', 'hartley', 'clapp']) t`);
  await k.raw(`
    insert into design_revisions (id, design_id, revision, components, spec, change_note, created_by)
    select gen_random_uuid(), d.id, 1, '{}'::jsonb, '{}'::jsonb, '', 'bench-layouts' from designs d where d.name like 'Bench design %'`);
  await k.raw(
    `insert into builds (id, design_id, design_revision_id, label, kind, kind_revision, built_by, as_built, created_by, created_at)
     select gen_random_uuid(), d.id, r.id, 'B-' || i,
            (array['breadboard', 'perfboard', 'pcb', 'other'])[1 + (i / 4) % 4],
            case when (i / 4) % 4 = 2 then 'rev ' || chr(65 + i % 3) else '' end,
            'bench-layouts', '{}'::jsonb, 'bench-layouts', now() - interval '60 days'
       from generate_series(0, ? - 1) i
       join designs d on d.name = 'Bench design ' || (array['tank', 'colpitts', 'hartley', 'clapp'])[1 + i % 4]
       join design_revisions r on r.design_id = d.id`,
    [builds],
  );
  // Runs n = 0.. spread round-robin over the builds; per build, every fourth run follows a note-only tweak.
  await k.raw(
    `with b as (select id, design_revision_id, row_number() over (order by id) - 1 as k from builds where built_by = 'bench-layouts')
     insert into runs (id, build_id, design_revision_id, object_key, sha256, size_bytes, original_filename, snapshot, predicted_hz,
                       status, results, measured_hz, frequency_uncertainty_hz, implied_extra_capacitance_f, created_by, created_at)
     select gen_random_uuid(), b.id, b.design_revision_id, 'bench/' || n, md5(n::text) || md5((n + 1)::text), 1000, 'run-' || n || '.csv',
            jsonb_build_object('predictedHz', 1e6, 'cEffF', 1e-9), 1e6, 'done',
            case when n % 17 = 0 then '{"warnings":[{"code":"clipping","message":"clipped"}]}'::jsonb else '{"warnings":[]}'::jsonb end,
            1e6 * sqrt(1e-9 / (1e-9 + c)), 0.5, c, 'bench-layouts',
            now() - interval '50 days' + (n || ' minutes')::interval
       from generate_series(0, ? - 1) n
       join b on b.k = n % ?
       cross join lateral (select (8 + (b.k % 7)) * 1e-12 + ((n * 7919) % 100) * 1e-15 as c) v`,
    [runs, builds],
  );
  await k.raw(
    `insert into tweaks (id, build_id, note, planned, created_by, created_at)
     select gen_random_uuid(), r.build_id, 'moved the leads', false, 'bench-layouts', r.created_at - interval '1 second'
       from (select build_id, created_at, row_number() over (partition by build_id order by created_at) as i from runs) r
      where r.i % 4 = 0`,
  );
  await k.raw("analyze");
}

async function main(): Promise<number> {
  const bin = pgLib.findPgBin();
  if (!bin) {
    console.error("bench:layouts: PostgreSQL is not installed; run `npm start` once (it installs it) or apt-get install postgresql");
    return 1;
  }
  const dataDir = pgLib.resolveDataDir(root, "bench-layouts/pg");
  pgLib.ensureCluster(bin, dataDir);
  pgLib.startCluster(bin, dataDir, PORT);
  try {
    pgLib.ensureDatabase(PORT, DATABASE, { fresh: true });
    process.env.DATABASE_URL = `postgres://postgres@127.0.0.1:${PORT}/${DATABASE}`;
    const migrator = knex({ ...config, connection: process.env.DATABASE_URL });
    await migrator.migrate.latest({ migrationSource: migrationSource() });
    await migrator.destroy();

    const fillStart = performance.now();
    await fill();
    const fillS = (performance.now() - fillStart) / 1000;
    const counts = await db().raw(`select (select count(*) from builds)::int as builds, (select count(*) from runs)::int as runs, (select count(*) from tweaks)::int as tweaks`);
    const c = counts.rows[0] as { builds: number; runs: number; tweaks: number };

    await listLayoutGroups(); // warm the cache and the plan once
    const times: number[] = [];
    let groups = 0;
    let steady = 0;
    for (let i = 0; i < repeat; i++) {
      const t = performance.now();
      const rows = await listLayoutGroups();
      times.push(performance.now() - t);
      groups = rows.length;
      steady = rows.reduce((s, g) => s + g.steadyBuilds.length, 0);
    }
    times.sort((a, b) => a - b);
    console.log(`bench:layouts — ${os.cpus().length} × ${os.cpus()[0]?.model ?? "cpu"}, Node ${process.version}, PostgreSQL on loopback`);
    console.log(`data: ${c.builds} builds, ${c.runs} runs (every 17th with a trust warning), ${c.tweaks} tweaks; filled in ${fillS.toFixed(1)} s`);
    console.log(`aggregate: ${groups} construction × topology groups, ${steady} steady builds`);
    console.log(
      `listLayoutGroups over ${repeat} calls: median ${quantile(times, 0.5).toFixed(1)} ms, p95 ${quantile(times, 0.95).toFixed(1)} ms, max ${times[times.length - 1].toFixed(1)} ms`,
    );
    return 0;
  } finally {
    await closeDb();
    pgLib.stopCluster(bin, dataDir);
  }
}

main().then(
  (code) => process.exit(code),
  (err) => {
    console.error(`bench:layouts failed: ${err instanceof Error ? err.stack : String(err)}`);
    process.exit(1);
  },
);
