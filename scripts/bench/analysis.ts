/**
 * `npm run bench`: speed and memory of the capture analysis against the reference Python pipeline,
 * printed against the targets of issue 14 as ratios measured side by side in one run.
 *
 * Generates (once, into the git-ignored bench-data/) a 1,000,000-sample and a 10,000,000-sample
 * three-column capture, then runs as whole processes, interleaved (each round runs every contender
 * once, the order rotating from round to round) so drifts in machine load hit all alike:
 *   - `npm run -s analyze -- FILE --json` (the command as package.json runs it),
 *   - `node scripts/run-analyze.mjs FILE --json` (the same command without npm's start-up),
 *   - `npm run -s analyze -- --help` and `node scripts/run-analyze.mjs --help` (1M rounds only):
 *     what npm's own start-up costs (the difference of their medians), reported apart,
 *   - `/usr/bin/python3 ../shared/bench/refpipe.py FILE` (pandas + numpy),
 * and prints medians, ranges, peak RSS, each target beside its figure, the machine's load average
 * (os.loadavg) before and after each size, and the commit measured.
 *
 *   npm run bench [-- --runs N] [-- --runs-10m N] [-- --skip-10m] [-- --stages]
 *
 * --stages adds the stage times of cold runs (scripts/bench/parts.ts, through tsx).
 */
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";
import { loadavg } from "node:os";
import path from "node:path";
import { aptInstall } from "../lib/apt.mjs";
import { ensureBenchCapture } from "./capture-files";

const ROOT = path.resolve(import.meta.dirname, "../..");
const PYTHON = "/usr/bin/python3";
const REFPIPE = path.resolve(ROOT, "../shared/bench/refpipe.py");
const TIME = "/usr/bin/time";
const LAUNCHER = path.join(ROOT, "scripts/run-analyze.mjs");

interface Sample {
  seconds: number;
  maxRssMB: number | null;
}

interface Contender {
  label: string;
  command: string[];
}

/** One figure against its target: `value` (a ratio or megabytes) must be below or at `limit`. */
interface Target {
  what: string;
  value: number | undefined;
  limit: number;
  unit: "×" | "MB";
  strict?: boolean;
}

function argValue(name: string): string | undefined {
  const index = process.argv.indexOf(name);
  return index >= 0 ? process.argv[index + 1] : undefined;
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

function load(): string {
  return loadavg()
    .map((l) => l.toFixed(2))
    .join(" / ");
}

function commit(): string {
  const head = spawnSync("git", ["rev-parse", "--short", "HEAD"], { cwd: ROOT, encoding: "utf8" }).stdout.trim() || "unknown";
  // The engine's own files only: other work in the checkout does not change what is measured.
  const dirty = spawnSync("git", ["status", "--porcelain", "--", "lib/analysis", "scripts/analyze.ts", "scripts/analyze-spectrum-worker.ts", "scripts/run-analyze.mjs"], {
    cwd: ROOT,
    encoding: "utf8",
  }).stdout.trim();
  return dirty ? `${head} (+ uncommitted engine changes)` : head;
}

/** Runs one whole process; wall time from here, peak RSS from GNU time (the largest process of the tree). */
function runOnce(command: string[]): Sample {
  const useTime = existsSync(TIME);
  const argv = useTime ? [TIME, "-f", "TANKBOOK_MAXRSS_KB=%M", ...command] : command;
  const started = process.hrtime.bigint();
  const result = spawnSync(argv[0], argv.slice(1), { cwd: ROOT, encoding: "utf8", maxBuffer: 64 << 20 });
  const seconds = Number(process.hrtime.bigint() - started) / 1e9;
  if (result.status !== 0) {
    throw new Error(`${command.join(" ")} failed (${result.status}): ${result.stderr.trim().split("\n").slice(-2).join(" ")}`);
  }
  const rss = /TANKBOOK_MAXRSS_KB=(\d+)/.exec(result.stderr ?? "");
  return { seconds, maxRssMB: rss ? Number(rss[1]) / 1024 : null };
}

const REFPIPE_PACKAGES = ["python3-numpy", "python3-pandas"];

const hasNumpyAndPandas = () => spawnSync(PYTHON, ["-c", "import numpy, pandas"], { encoding: "utf8" }).status === 0;

/**
 * Undefined when the reference pipeline can run, else why not. Its Debian packages are installed here when
 * missing and this runs as root (as `npm start` installs PostgreSQL), so a fresh machine measures both sides.
 */
function pythonStatus(): string | undefined {
  if (!existsSync(PYTHON)) return `${PYTHON} not found`;
  if (!existsSync(REFPIPE)) return `${REFPIPE} not found`;
  if (hasNumpyAndPandas()) return undefined;
  try {
    aptInstall(REFPIPE_PACKAGES, (line) => console.log(`${line} (for the reference pipeline)`));
  } catch (error) {
    return error instanceof Error ? error.message : String(error);
  }
  return hasNumpyAndPandas() ? undefined : `${REFPIPE_PACKAGES.join(" and ")} are installed, but python3 still cannot import numpy and pandas`;
}

function measure(contenders: Contender[], runs: number): Map<string, Sample[]> {
  const samples = new Map<string, Sample[]>(contenders.map((c) => [c.label, []]));
  // One untimed round first, so the file is in the page cache and the bundle is built for everyone.
  for (const c of contenders) runOnce(c.command);
  for (let run = 0; run < runs; run++) {
    for (let k = 0; k < contenders.length; k++) {
      const c = contenders[(k + run) % contenders.length];
      samples.get(c.label)?.push(runOnce(c.command));
    }
  }
  return samples;
}

function medianOf(samples: Map<string, Sample[]>, label: string): number | undefined {
  const list = samples.get(label);
  return list && list.length ? median(list.map((s) => s.seconds)) : undefined;
}

function rssOf(samples: Map<string, Sample[]>, label: string): number | undefined {
  const rss = (samples.get(label) ?? []).map((s) => s.maxRssMB).filter((v): v is number => v !== null);
  return rss.length ? Math.max(...rss) : undefined;
}

function table(rows: string[][]): void {
  const widths = rows[0].map((_, i) => Math.max(...rows.map((r) => r[i].length)));
  for (const row of rows) console.log("  " + row.map((cell, i) => (i === 0 ? cell.padEnd(widths[i]) : cell.padStart(widths[i]))).join("  "));
}

function summarise(samples: Map<string, Sample[]>, reference: string | undefined): void {
  const rows: string[][] = [["command", "median s", "min s", "max s", "peak RSS MB", "vs refpipe"]];
  const referenceMedian = reference ? medianOf(samples, reference) : undefined;
  for (const [label, list] of samples) {
    const times = list.map((s) => s.seconds);
    const m = median(times);
    const rss = rssOf(samples, label);
    rows.push([
      label,
      m.toFixed(3),
      Math.min(...times).toFixed(3),
      Math.max(...times).toFixed(3),
      rss === undefined ? "n/a" : rss.toFixed(0),
      referenceMedian && label !== reference ? `${(m / referenceMedian).toFixed(2)}×` : "",
    ]);
  }
  table(rows);
}

function printTargets(targets: Target[]): void {
  const rows = [["target", "figure", "limit", "met"]];
  for (const t of targets) {
    const figure = t.value === undefined ? "n/a" : t.unit === "×" ? `${t.value.toFixed(2)}×` : `${t.value.toFixed(0)} MB`;
    const limit = `${t.strict ? "<" : "≤"} ${t.unit === "×" ? `${t.limit}×` : `${t.limit} MB`}`;
    const met = t.value === undefined ? "?" : (t.strict ? t.value < t.limit : t.value <= t.limit) ? "yes" : "NO";
    rows.push([t.what, figure, limit, met]);
  }
  table(rows);
}

function stages(file: string, runs: number): void {
  const keys = ["readMs", "importMs", "fftMs", "fitMs", "harmonicsMs", "checksMs", "twoChannelMs", "plotMs", "analysisMs", "maxRssMB"];
  const collected: Record<string, number[]> = Object.fromEntries(keys.map((k) => [k, []]));
  for (let run = 0; run < runs; run++) {
    const result = spawnSync(path.join(ROOT, "node_modules/.bin/tsx"), [path.join(ROOT, "scripts/bench/parts.ts"), file], { cwd: ROOT, encoding: "utf8" });
    if (result.status !== 0) throw new Error(`parts.ts failed: ${result.stderr}`);
    const figures = JSON.parse(result.stdout) as Record<string, number>;
    for (const k of keys) collected[k].push(figures[k]);
  }
  console.log(`  stages of a cold single-thread run (median of ${runs}, ms; peak RSS in MB):`);
  console.log("  " + keys.map((k) => `${k.replace(/Ms$|MB$/, "")} ${median(collected[k]).toFixed(0)}`).join(" · "));
}

const NPM = "npm run -s analyze -- FILE --json";
const NODE = "node scripts/run-analyze.mjs FILE --json";
const NPM_HELP = "npm run -s analyze -- --help";
const NODE_HELP = "node scripts/run-analyze.mjs --help";
const REF = "refpipe.py FILE";

async function main(): Promise<void> {
  const runs = Number(argValue("--runs") ?? 7);
  const runs10m = Number(argValue("--runs-10m") ?? 3);
  const skip10m = process.argv.includes("--skip-10m");
  console.log(`Tankbook analysis benchmark · commit ${commit()} · Node ${process.version} · ${new Date().toISOString()}`);
  const file1m = await ensureBenchCapture("capture-1m.csv", 1_000_000);
  const file10m = skip10m ? undefined : await ensureBenchCapture("capture-10m.csv", 10_000_000);
  const missingPython = pythonStatus();
  if (missingPython) console.log(`\nreference pipeline unavailable: ${missingPython}; printing our own figures only`);
  const reference = missingPython ? undefined : REF;

  const contenders = (file: string, withHelp: boolean): Contender[] => [
    { label: NPM, command: ["npm", "run", "-s", "analyze", "--", file, "--json"] },
    { label: NODE, command: [process.execPath, LAUNCHER, file, "--json"] },
    ...(withHelp
      ? [
          { label: NPM_HELP, command: ["npm", "run", "-s", "analyze", "--", "--help"] },
          { label: NODE_HELP, command: [process.execPath, LAUNCHER, "--help"] },
        ]
      : []),
    ...(reference ? [{ label: REF, command: [PYTHON, REFPIPE, file] }] : []),
  ];

  const loadBefore1m = load();
  console.log(`\n1,000,000 samples, 3 columns (${file1m}), ${runs} interleaved rounds; load average (1/5/15 min) ${loadBefore1m}`);
  const samples1m = measure(contenders(file1m, true), runs);
  summarise(samples1m, reference);
  const npmStartupS = (medianOf(samples1m, NPM_HELP) ?? NaN) - (medianOf(samples1m, NODE_HELP) ?? NaN);
  const ref1m = reference ? medianOf(samples1m, reference) : undefined;
  const ratio = (label: string, samples: Map<string, Sample[]>, ref: number | undefined) => {
    const m = medianOf(samples, label);
    return m !== undefined && ref !== undefined ? m / ref : undefined;
  };
  console.log(
    `  npm's own start-up: ${(npmStartupS * 1000).toFixed(0)} ms (median of '${NPM_HELP}' minus that of '${NODE_HELP}'); ` +
      `the command's start-up without npm: ${((medianOf(samples1m, NODE_HELP) ?? NaN) * 1000).toFixed(0)} ms`,
  );
  console.log(`  load average after: ${load()}`);
  const targets: Target[] = [
    { what: "1M: npm run -s analyze vs refpipe (median ratio)", value: ratio(NPM, samples1m, ref1m), limit: 0.6, unit: "×" },
    { what: "1M: the command's own work (node, no npm) vs refpipe", value: ratio(NODE, samples1m, ref1m), limit: 0.35, unit: "×" },
  ];
  if (process.argv.includes("--stages")) stages(file1m, Math.min(runs, 5));

  if (file10m) {
    const loadBefore = load();
    console.log(`\n10,000,000 samples, 3 columns (${file10m}), ${runs10m} interleaved rounds; load average ${loadBefore}`);
    const samples10m = measure(contenders(file10m, false), runs10m);
    summarise(samples10m, reference);
    console.log(`  load average after: ${load()}`);
    const ref10m = reference ? medianOf(samples10m, reference) : undefined;
    targets.push(
      { what: "10M: npm run -s analyze vs refpipe (median ratio)", value: ratio(NPM, samples10m, ref10m), limit: 0.5, unit: "×" },
      { what: "10M: the command (node) vs refpipe", value: ratio(NODE, samples10m, ref10m), limit: 0.5, unit: "×" },
      { what: "10M: peak RSS of the command (largest of the runs)", value: rssOf(samples10m, NODE), limit: 250, unit: "MB", strict: true },
    );
  }
  console.log(`\nTargets (issue 14), commit ${commit()}:`);
  printTargets(targets);
}

main().catch((error: unknown) => {
  console.error(`bench: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 1;
});
