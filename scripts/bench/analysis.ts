/**
 * `npm run bench`: speed and memory of the capture analysis against the reference Python pipeline.
 *
 * Generates (once, into the git-ignored bench-data/) a 1,000,000-sample and a 10,000,000-sample
 * three-column capture, then measures, as whole processes alternating with each other:
 *   - `npm run -s analyze -- FILE --json` (the command as package.json runs it),
 *   - the same through npm with the proposed package.json line `node scripts/run-analyze.mjs`,
 *   - `node scripts/run-analyze.mjs FILE --json` (the same command without tsx's start-up),
 *   - `/usr/bin/python3 ../shared/bench/refpipe.py FILE` (pandas + numpy),
 * and prints medians of wall time and peak RSS, the ratios, and the stages of a cold run
 * (read, import, FFT, fit, harmonics, checks) from scripts/bench/parts.ts.
 *
 *   npm run bench [-- --runs N] [-- --skip-10m]
 */
import { spawnSync } from "node:child_process";
import { existsSync, mkdirSync, writeFileSync } from "node:fs";
import path from "node:path";
import { BENCH_DATA_DIR, ensureBenchCapture } from "./capture-files";

const ROOT = path.resolve(import.meta.dirname, "../..");
const PYTHON = "/usr/bin/python3";
const REFPIPE = path.resolve(ROOT, "../shared/bench/refpipe.py");
const TIME = "/usr/bin/time";

interface Sample {
  seconds: number;
  maxRssMB: number | null;
}

interface Contender {
  label: string;
  command: string[];
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

function pythonStatus(): string | undefined {
  if (!existsSync(PYTHON)) return `${PYTHON} not found`;
  if (!existsSync(REFPIPE)) return `${REFPIPE} not found`;
  const probe = spawnSync(PYTHON, ["-c", "import numpy, pandas"], { encoding: "utf8" });
  return probe.status === 0 ? undefined : "python3-numpy/python3-pandas are not installed (apt-get install -y python3-numpy python3-pandas)";
}

/**
 * A throw-away npm project in bench-data/ whose "analyze" script is the line proposed for
 * package.json, so npm's own start-up is measured exactly as it would be after the change.
 */
function proposedNpmProject(): string {
  const dir = path.join(BENCH_DATA_DIR, "npm-proposed");
  mkdirSync(dir, { recursive: true });
  const script = `node ${JSON.stringify(path.join(ROOT, "scripts/run-analyze.mjs"))}`;
  writeFileSync(path.join(dir, "package.json"), JSON.stringify({ name: "tankbook-bench-proposed", private: true, scripts: { analyze: script } }, null, 2));
  return dir;
}

function measure(contenders: Contender[], runs: number): Map<string, Sample[]> {
  const samples = new Map<string, Sample[]>(contenders.map((c) => [c.label, []]));
  // One untimed round first, so the file is in the page cache and the bundle is built for everyone.
  for (const c of contenders) runOnce(c.command);
  for (let run = 0; run < runs; run++) {
    // Alternate, and rotate who goes first, so drifts in machine load hit everyone alike.
    for (let k = 0; k < contenders.length; k++) {
      const c = contenders[(k + run) % contenders.length];
      samples.get(c.label)?.push(runOnce(c.command));
    }
  }
  return samples;
}

function summarise(title: string, samples: Map<string, Sample[]>, reference: string | undefined): void {
  console.log(`\n${title}`);
  const rows: string[][] = [["command", "median s", "min s", "max s", "peak RSS MB", "vs refpipe"]];
  const referenceMedian = reference ? median((samples.get(reference) ?? []).map((s) => s.seconds)) : undefined;
  for (const [label, list] of samples) {
    const times = list.map((s) => s.seconds);
    const rss = list.map((s) => s.maxRssMB).filter((v): v is number => v !== null);
    const m = median(times);
    rows.push([
      label,
      m.toFixed(3),
      Math.min(...times).toFixed(3),
      Math.max(...times).toFixed(3),
      rss.length ? median(rss).toFixed(0) : "n/a",
      referenceMedian && label !== reference ? `${(m / referenceMedian).toFixed(2)}×` : "",
    ]);
  }
  const widths = rows[0].map((_, i) => Math.max(...rows.map((r) => r[i].length)));
  for (const row of rows) console.log("  " + row.map((cell, i) => (i === 0 ? cell.padEnd(widths[i]) : cell.padStart(widths[i]))).join("  "));
}

function parts(file: string, runs: number): void {
  const keys = ["readMs", "importMs", "fftMs", "fitMs", "harmonicsMs", "checksMs", "twoChannelMs", "plotMs", "analysisMs", "maxRssMB"];
  const collected: Record<string, number[]> = Object.fromEntries(keys.map((k) => [k, []]));
  for (let run = 0; run < runs; run++) {
    const result = spawnSync(path.join(ROOT, "node_modules/.bin/tsx"), [path.join(ROOT, "scripts/bench/parts.ts"), file], {
      cwd: ROOT,
      encoding: "utf8",
    });
    if (result.status !== 0) throw new Error(`parts.ts failed: ${result.stderr}`);
    const figures = JSON.parse(result.stdout) as Record<string, number>;
    for (const k of keys) collected[k].push(figures[k]);
  }
  console.log(`  stages of a cold run (median of ${runs}, ms; peak RSS in MB):`);
  console.log("  " + keys.map((k) => `${k.replace(/Ms$|MB$/, "")} ${median(collected[k]).toFixed(0)}`).join(" · "));
}

async function main(): Promise<void> {
  const runs = Number(argValue("--runs") ?? 7);
  const skip10m = process.argv.includes("--skip-10m");
  console.log("Tankbook analysis benchmark (generating captures into bench-data/ on first use)");
  const file1m = await ensureBenchCapture("capture-1m.csv", 1_000_000);
  const file10m = skip10m ? undefined : await ensureBenchCapture("capture-10m.csv", 10_000_000);
  const missingPython = pythonStatus();
  if (missingPython) console.log(`\nreference pipeline unavailable: ${missingPython}; printing our own figures only`);

  const proposed = proposedNpmProject();
  const contenders = (file: string): Contender[] => [
    { label: "npm run -s analyze -- FILE --json", command: ["npm", "run", "-s", "analyze", "--", file, "--json"] },
    {
      label: "same, proposed line (node scripts/run-analyze.mjs)",
      command: ["npm", "run", "-s", "--prefix", proposed, "analyze", "--", file, "--json"],
    },
    { label: "node scripts/run-analyze.mjs FILE --json", command: [process.execPath, path.join(ROOT, "scripts/run-analyze.mjs"), file, "--json"] },
    ...(missingPython ? [] : [{ label: "refpipe.py FILE", command: [PYTHON, REFPIPE, file] }]),
  ];

  const samples1m = measure(contenders(file1m), runs);
  summarise(`1,000,000 samples, 3 columns (${file1m}), ${runs} alternating runs each`, samples1m, missingPython ? undefined : "refpipe.py FILE");
  parts(file1m, Math.min(runs, 5));

  if (file10m) {
    const runs10m = Math.max(1, Math.min(3, runs));
    const samples10m = measure(contenders(file10m).filter((c) => !c.label.startsWith("npm")), runs10m);
    summarise(`10,000,000 samples, 3 columns (${file10m}), ${runs10m} alternating runs each`, samples10m, missingPython ? undefined : "refpipe.py FILE");
    parts(file10m, 1);
  }
}

main().catch((error: unknown) => {
  console.error(`bench: ${error instanceof Error ? error.message : String(error)}`);
  process.exitCode = 1;
});
