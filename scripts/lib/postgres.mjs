// Control of the project's own PostgreSQL cluster (Debian's binaries, loopback only).
// Plain JavaScript so the bootstrap can use it before `npm install` has run.
import { execFileSync, spawnSync } from "node:child_process";
import { randomBytes } from "node:crypto";
import {
  existsSync,
  mkdirSync,
  readdirSync,
  readFileSync,
  writeFileSync,
  chmodSync,
  accessSync,
  constants,
} from "node:fs";
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

export function runPg(pgBin, tool, args, { allowFail = false, input } = {}) {
  const [cmd, argv] = pgCommand(pgBin, tool, args);
  const r = spawnSync(cmd, argv, { encoding: "utf8", input });
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

/**
 * Starts the cluster on 127.0.0.1:port. By default with the fast settings of a throw-away cluster (npm test,
 * benchmarks): fsync, synchronous_commit and full_page_writes off, which the PostgreSQL docs (19.5, "Write Ahead
 * Log") say can lose committed data or corrupt the cluster on an OS crash. `durable: true` (npm start) keeps
 * PostgreSQL's own defaults, all three on.
 */
export function startCluster(pgBin, dataDir, port, { durable = false } = {}) {
  if (isRunning(pgBin, dataDir)) return false;
  // No unix socket: the project tree is scanned by Tailwind, and a socket file there breaks the build.
  const opts = [
    "-c listen_addresses=127.0.0.1",
    `-p ${port}`,
    "-c unix_socket_directories=''",
    ...(durable ? [] : ["-c fsync=off", "-c synchronous_commit=off", "-c full_page_writes=off"]),
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

function psql(port, sql, { db = "postgres", password } = {}) {
  const env = { ...process.env };
  if (password !== undefined) env.PGPASSWORD = password;
  return execFileSync("psql", ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", "-d", db, "-w", "-tAc", sql], {
    encoding: "utf8",
    env,
  }).trim();
}

export function ensureDatabase(port, name, { fresh = false, password } = {}) {
  if (!/^[a-z_][a-z0-9_]*$/.test(name)) throw new Error(`bad database name ${name}`);
  if (fresh) psql(port, `drop database if exists ${name} with (force)`, { password });
  if (psql(port, `select 1 from pg_database where datname = '${name}'`, { password }) !== "1") {
    psql(port, `create database ${name}`, { password });
    return true;
  }
  return false;
}

// Written at the top of pg_hba.conf once the cluster takes passwords only; its absence marks a cluster made by
// the old scripts (initdb -A trust, run with fsync off) that still needs the upgrade below.
const HBA_MARKER = "# Tankbook: password authentication (scram-sha-256) on loopback only";
const HBA = `${HBA_MARKER}
# Written by scripts/lib/postgres.mjs; it is rewritten if this first line is changed.
# TYPE  DATABASE  USER  ADDRESS       METHOD
host    all       all   127.0.0.1/32  scram-sha-256
host    all       all   ::1/128       scram-sha-256
`;

/** The cluster's password from `file` (mode 0600), made from 24 random bytes on first use. */
export function clusterPassword(file) {
  if (existsSync(file)) {
    const saved = readFileSync(file, "utf8").trim();
    if (saved) {
      chmodSync(file, 0o600);
      return { password: saved, created: false };
    }
  }
  const password = randomBytes(24).toString("base64url");
  writeFileSync(file, `${password}\n`, { mode: 0o600 });
  chmodSync(file, 0o600);
  return { password, created: true };
}

/**
 * Makes a stopped cluster durable and password-protected, in place and without touching its data:
 * sets the `postgres` role's password in single-user mode (no connection is ever accepted without it),
 * replaces pg_hba.conf with scram-sha-256 on loopback, drops any fsync / synchronous_commit /
 * full_page_writes override from postgresql.auto.conf and, for a cluster that ran with fsync off, flushes
 * its files to disk first (`initdb --sync-only`, as the PostgreSQL docs on `fsync` ask when turning it back on).
 * Does nothing when the cluster is already set up and the password file is unchanged.
 * @returns "created" | "upgraded" | "password-set" | "unchanged"
 */
export function secureCluster(pgBin, dataDir, passwordFile, { fresh = false } = {}) {
  if (isRunning(pgBin, dataDir)) throw new Error(`secureCluster needs the cluster in ${dataDir} stopped`);
  const { password, created } = clusterPassword(passwordFile);
  const hbaFile = path.join(dataDir, "pg_hba.conf");
  const secured = existsSync(hbaFile) && readFileSync(hbaFile, "utf8").startsWith(HBA_MARKER);
  if (secured && !created) return "unchanged";

  if (!secured) {
    // initdb --no-sync and the old fsync=off runs may both have left files only in the OS cache.
    runPg(pgBin, "initdb", ["-D", dataDir, "--sync-only"]);
    const autoConf = path.join(dataDir, "postgresql.auto.conf");
    if (existsSync(autoConf)) {
      const text = readFileSync(autoConf, "utf8");
      const kept = text.replace(/^\s*(fsync|synchronous_commit|full_page_writes)\s*=.*\n?/gm, "");
      if (kept !== text) writeFileSync(autoConf, kept);
    }
  }
  // Single-user mode reads the statement from stdin and needs no authentication, so the password is set
  // before the server ever listens with the new rules (and never travels on a command line).
  runPg(pgBin, "postgres", ["--single", "-D", dataDir, "postgres"], {
    input: `ALTER ROLE postgres PASSWORD '${password}'\n`,
  });
  if (!secured) writeFileSync(hbaFile, HBA);
  return fresh ? "created" : secured ? "password-set" : "upgraded";
}
