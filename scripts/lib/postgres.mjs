// Control of the project's own PostgreSQL cluster (Debian's binaries, loopback only).
// Plain JavaScript so the bootstrap can use it before `npm install` has run.
import { execFileSync, spawnSync } from "node:child_process";
import { existsSync, mkdirSync, readdirSync, chmodSync, accessSync, constants } from "node:fs";
import path from "node:path";
import os from "node:os";

const isRoot = typeof process.getuid === "function" && process.getuid() === 0;

/** The newest /usr/lib/postgresql/<v>/bin that has a server binary, or null. */
export function findPgBin() {
  const base = "/usr/lib/postgresql";
  if (!existsSync(base)) return null;
  const versions = readdirSync(base)
    .filter((v) => existsSync(path.join(base, v, "bin", "postgres")))
    .sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], "bin") : null;
}

/** Runs a PostgreSQL binary as the `postgres` OS user when we are root: the server refuses to run as root. */
function pgCommand(pgBin, tool, args) {
  const bin = path.join(pgBin, tool);
  return isRoot ? ["runuser", ["-u", "postgres", "--", bin, ...args]] : [bin, args];
}

export function runPg(pgBin, tool, args, { allowFail = false } = {}) {
  const [cmd, argv] = pgCommand(pgBin, tool, args);
  const r = spawnSync(cmd, argv, { encoding: "utf8" });
  if (r.status !== 0 && !allowFail) {
    throw new Error(`${tool} failed (exit ${r.status}): ${(r.stderr || r.stdout || "").trim()}`);
  }
  return r;
}

/**
 * Where the cluster's files live. Inside the project (git-ignored) when the postgres user can reach it,
 * otherwise under the system temp dir, because every parent directory must let that user through.
 */
export function resolveDataDir(projectDir, name) {
  const inProject = path.join(projectDir, ".data", name);
  if (!isRoot) return inProject;
  const probe = spawnSync("runuser", ["-u", "postgres", "--", "test", "-x", projectDir]);
  if (probe.status === 0) return inProject;
  const key = Buffer.from(projectDir).toString("base64url").slice(-16);
  return path.join(os.tmpdir(), `tankbook-${key}`, name);
}

export function ensureCluster(pgBin, dataDir) {
  if (existsSync(path.join(dataDir, "PG_VERSION"))) return false;
  mkdirSync(dataDir, { recursive: true });
  if (isRoot) {
    execFileSync("chown", ["postgres:postgres", dataDir]);
    // Parents we created ourselves must stay traversable by the postgres user.
    for (let d = path.dirname(dataDir); d !== path.dirname(d); d = path.dirname(d)) {
      try {
        accessSync(d, constants.X_OK);
      } catch {
        break;
      }
      if (d.endsWith(".data") || path.basename(d).startsWith("tankbook-")) chmodSync(d, 0o755);
    }
  }
  chmodSync(dataDir, 0o700);
  runPg(pgBin, "initdb", ["-D", dataDir, "-U", "postgres", "-A", "trust", "-E", "UTF8", "--locale=C.UTF-8", "--no-sync"]);
  return true;
}

export function isRunning(pgBin, dataDir) {
  return runPg(pgBin, "pg_ctl", ["-D", dataDir, "status"], { allowFail: true }).status === 0;
}

export function startCluster(pgBin, dataDir, port) {
  if (isRunning(pgBin, dataDir)) return false;
  // No unix socket: the project tree is scanned by Tailwind, and a socket file there breaks the build.
  const opts = [
    "-c listen_addresses=127.0.0.1",
    `-p ${port}`,
    "-c unix_socket_directories=''",
    "-c fsync=off",
    "-c synchronous_commit=off",
    "-c full_page_writes=off",
    "-c max_connections=200",
  ].join(" ");
  runPg(pgBin, "pg_ctl", ["-D", dataDir, "-l", path.join(dataDir, "server.log"), "-w", "-s", "-t", "60", "-o", opts, "start"]);
  return true;
}

export function stopCluster(pgBin, dataDir) {
  if (!isRunning(pgBin, dataDir)) return false;
  runPg(pgBin, "pg_ctl", ["-D", dataDir, "-w", "-s", "-m", "fast", "stop"], { allowFail: true });
  return true;
}

function psql(port, sql, db = "postgres") {
  return execFileSync("psql", ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", "-d", db, "-tAc", sql], {
    encoding: "utf8",
  }).trim();
}

export function ensureDatabase(port, name, { fresh = false } = {}) {
  if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`bad database name ${name}`);
  if (fresh) psql(port, `drop database if exists ${name} with (force)`);
  if (psql(port, `select 1 from pg_database where datname = '${name}'`) !== "1") {
    psql(port, `create database ${name}`);
    return true;
  }
  return false;
}
