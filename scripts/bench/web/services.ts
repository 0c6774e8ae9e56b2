// The bench's own processes: a PostgreSQL cluster of its own, the fake S3 and fake SMTP, the production build,
// `next start` and one analysis worker. Each service runs in its own process, as under `npm start`, so the load
// generator in this process never shares an event loop with what it measures.
import { spawn, spawnSync, type ChildProcess } from "node:child_process";
import { createWriteStream, existsSync, mkdirSync, readFileSync, readdirSync, rmSync, statSync, writeFileSync } from "node:fs";
import net from "node:net";
import path from "node:path";
import * as pgLib from "../../lib/postgres.mjs";
import { appUrl, bench, benchEnv, root } from "./config";

interface Child {
  name: string;
  child: ChildProcess;
}

function portOpen(port: number): Promise<boolean> {
  return new Promise((resolve) => {
    const socket = net.connect({ host: "127.0.0.1", port }, () => {
      socket.destroy();
      resolve(true);
    });
    socket.on("error", () => resolve(false));
  });
}

function newestMtime(dir: string): number {
  if (!existsSync(dir)) return 0;
  let newest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    if (entry.name === "node_modules" || entry.name.startsWith(".")) continue;
    const p = path.join(dir, entry.name);
    newest = Math.max(newest, entry.isDirectory() ? newestMtime(p) : statSync(p).mtimeMs);
  }
  return newest;
}

/** The same staleness rule as scripts/bootstrap.mjs, for the bench's own build folder. */
function buildIsStale(): boolean {
  const buildId = path.join(root, bench.distDir, "BUILD_ID");
  if (!existsSync(buildId)) return true;
  const built = statSync(buildId).mtimeMs;
  const sources = ["app", "components", "lib", "db", "fonts", "public"].map((d) => newestMtime(path.join(root, d)));
  const configs = ["next.config.mjs", "tailwind.config.ts", "postcss.config.mjs", "package-lock.json", "tsconfig.json"]
    .map((f) => path.join(root, f))
    .filter((f) => existsSync(f))
    .map((f) => statSync(f).mtimeMs);
  return Math.max(...sources, ...configs) > built;
}

/** Everything the bench started, stopped again by {@link BenchServices.stopAll} (also after an error). */
export class BenchServices {
  private children: Child[] = [];
  private pg: { bin: string; dataDir: string } | null = null;
  private logDir = path.join(bench.dataDir, "logs");

  constructor(private readonly log: (line: string) => void) {}

  /** Refuses to start when a port of the bench stack is taken (another bench still running). */
  async checkPortsFree(): Promise<void> {
    const ports: [number, string][] = [
      [bench.pgPort, "PostgreSQL"],
      [bench.s3Port, "fake S3"],
      [bench.smtpPort, "fake SMTP"],
      [bench.smtpApiPort, "fake SMTP API"],
      [bench.appPort, "web app"],
    ];
    for (const [port, what] of ports) {
      if (await portOpen(port)) throw new Error(`port ${port} (${what}) is already in use: is another bench still running?`);
    }
  }

  /** Own cluster (kept between runs, like `npm start`'s) with a fresh database, migrated. */
  startPostgres(): void {
    const bin = pgLib.findPgBin();
    if (!bin) throw new Error("PostgreSQL is not installed; run `npm start` once (it installs it) or apt-get install postgresql");
    const dataDir = pgLib.resolveDataDir(root, "bench/pg");
    if (pgLib.ensureCluster(bin, dataDir)) this.log(`created a PostgreSQL cluster in ${dataDir}`);
    // A cluster left running by an interrupted bench is ours too: take it over and stop it at the end.
    pgLib.startCluster(bin, dataDir, bench.pgPort);
    this.pg = { bin, dataDir };
    pgLib.ensureDatabase(bench.pgPort, bench.database, { fresh: true });
    this.log(`PostgreSQL on 127.0.0.1:${bench.pgPort}, fresh database ${bench.database}`);
  }

  async startFakeServices(): Promise<void> {
    rmSync(path.join(bench.dataDir, "s3"), { recursive: true, force: true });
    rmSync(path.join(bench.dataDir, "smtp"), { recursive: true, force: true });
    mkdirSync(this.logDir, { recursive: true });
    const s3 = this.spawnNode("fake S3", [
      "--import", "tsx", "fake-s3/main.ts",
      "--port", String(bench.s3Port), "--dir", path.join(bench.dataDir, "s3"), "--bucket", bench.bucket, "--origin", appUrl,
    ]);
    const smtp = this.spawnNode("fake SMTP", [
      "--import", "tsx", "fake-smtp/main.ts",
      "--smtp-port", String(bench.smtpPort), "--api-port", String(bench.smtpApiPort), "--dir", path.join(bench.dataDir, "smtp"),
    ]);
    await Promise.all([this.waitForPort(bench.s3Port, s3), this.waitForPort(bench.smtpApiPort, smtp)]);
  }

  migrate(): void {
    this.runNode("migrations", ["--import", "tsx", "scripts/migrate.ts", "latest"]);
  }

  /**
   * `next build` into .next-bench when sources are newer than it. Next adds its dist folder's type globs to
   * tsconfig.json on every build; the file is put back as it was, since the bench does not own it.
   */
  buildIfStale(): void {
    if (!buildIsStale()) {
      this.log(`production build in ${bench.distDir} is current`);
      return;
    }
    this.log(`building the app into ${bench.distDir} (sources changed since the last bench build)`);
    const tsconfig = path.join(root, "tsconfig.json");
    const before = readFileSync(tsconfig, "utf8");
    const started = Date.now();
    try {
      this.runNode("next build", ["node_modules/next/dist/bin/next", "build"], { NODE_ENV: "production" });
    } finally {
      if (readFileSync(tsconfig, "utf8") !== before) writeFileSync(tsconfig, before);
    }
    this.log(`built in ${((Date.now() - started) / 1000).toFixed(0)} s`);
  }

  /**
   * `next start` and one standalone analysis worker (what `npm start` runs beside the app).
   * @param options.cpuProfileDir - run next-server under --cpu-prof, writing its profile there when it stops
   */
  async startAppAndWorker(options: { cpuProfileDir?: string } = {}): Promise<void> {
    const profile = options.cpuProfileDir ? ["--cpu-prof", "--cpu-prof-dir", options.cpuProfileDir] : [];
    if (options.cpuProfileDir) rmSync(options.cpuProfileDir, { recursive: true, force: true });
    const app = this.spawnNode("web app", [...profile, "node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(bench.appPort)], {
      NODE_ENV: "production",
    });
    this.spawnNode("analysis worker", ["--import", "tsx", "scripts/worker.ts"]);
    await this.waitForPort(bench.appPort, app, 120_000);
  }

  /** Stops every child (SIGTERM, then SIGKILL after 5 s) and the PostgreSQL cluster. Safe to call twice. */
  async stopAll(): Promise<void> {
    const children = this.children.reverse();
    this.children = [];
    for (const { child } of children) if (child.exitCode === null && child.signalCode === null) child.kill("SIGTERM");
    await Promise.all(
      children.map(
        ({ child }) =>
          new Promise<void>((resolve) => {
            if (child.exitCode !== null || child.signalCode !== null) return resolve();
            const timer = setTimeout(() => {
              child.kill("SIGKILL");
              resolve();
            }, 5000);
            child.once("exit", () => {
              clearTimeout(timer);
              resolve();
            });
          }),
      ),
    );
    if (this.pg) {
      pgLib.stopCluster(this.pg.bin, this.pg.dataDir);
      this.pg = null;
    }
  }

  /** Child output goes to .data/bench/logs/<name>.log, so the printed figures stay readable. */
  private spawnNode(name: string, args: string[], extraEnv: Record<string, string> = {}): ChildProcess {
    mkdirSync(this.logDir, { recursive: true });
    const logFile = createWriteStream(path.join(this.logDir, `${name.replace(/\W+/g, "-")}.log`));
    const child = spawn(process.execPath, args, {
      cwd: root,
      env: { ...process.env, ...benchEnv, ...extraEnv },
      stdio: ["ignore", "pipe", "pipe"],
    });
    child.stdout?.pipe(logFile);
    child.stderr?.pipe(logFile);
    child.once("exit", (code, signal) => {
      if (this.children.some((c) => c.child === child)) this.log(`${name} stopped unexpectedly (exit ${code ?? signal}); see ${this.logDir}`);
    });
    this.children.push({ name, child });
    return child;
  }

  private runNode(what: string, args: string[], extraEnv: Record<string, string> = {}): void {
    const r = spawnSync(process.execPath, args, { cwd: root, env: { ...process.env, ...benchEnv, ...extraEnv }, encoding: "utf8" });
    if (r.status !== 0) throw new Error(`${what} failed (exit ${r.status}):\n${(r.stderr || r.stdout || "").trim().slice(-4000)}`);
  }

  private async waitForPort(port: number, child: ChildProcess, timeoutMs = 60_000): Promise<void> {
    const until = Date.now() + timeoutMs;
    while (Date.now() < until) {
      if (child.exitCode !== null) throw new Error(`a bench service exited early (code ${child.exitCode}); see ${this.logDir}`);
      if (await portOpen(port)) return;
      await new Promise((r) => setTimeout(r, 150));
    }
    throw new Error(`nothing listened on 127.0.0.1:${port} within ${timeoutMs / 1000} s`);
  }
}
