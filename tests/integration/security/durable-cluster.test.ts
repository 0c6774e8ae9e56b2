// The `npm start` cluster's set-up, on a cluster of its own in a temp dir and a free port: one made the old way
// (initdb -A trust, run with fsync off) is upgraded in place by secureCluster, keeps its rows, then runs with
// PostgreSQL's durable defaults and refuses a connection without the password (PostgreSQL docs 19.5 "Write Ahead
// Log" for fsync / synchronous_commit / full_page_writes, 21.5 "Password Authentication" for scram-sha-256).
import { execFileSync } from "node:child_process";
import { mkdtempSync, readFileSync, rmSync, statSync } from "node:fs";
import net from "node:net";
import os from "node:os";
import path from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import {
  clusterPassword,
  ensureCluster,
  findPgBin,
  secureCluster,
  startCluster,
  stopCluster,
} from "../../../scripts/lib/postgres.mjs";

const pgBin = findPgBin()!;
const root = mkdtempSync(path.join(os.tmpdir(), "tankbook-durable-"));
const dataDir = path.join(root, "pg");
const passwordFile = path.join(root, "pg-password");

afterAll(() => {
  stopCluster(pgBin, dataDir);
  rmSync(root, { recursive: true, force: true });
});

function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const server = net.createServer();
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      const { port } = server.address() as net.AddressInfo;
      server.close(() => resolve(port));
    });
  });
}

function psql(port: number, sql: string, password?: string): string {
  const env = { ...process.env };
  delete env.PGPASSWORD;
  if (password !== undefined) env.PGPASSWORD = password;
  return execFileSync("psql", ["-h", "127.0.0.1", "-p", String(port), "-U", "postgres", "-d", "postgres", "-w", "-tAc", sql], {
    encoding: "utf8",
    env,
    stdio: ["ignore", "pipe", "pipe"],
  }).trim();
}

function refusal(port: number, password?: string): string {
  try {
    psql(port, "select 1", password);
  } catch (err) {
    return String((err as { stderr?: string }).stderr ?? err);
  }
  return "connected";
}

describe("the npm start cluster", () => {
  it("upgrades an old trust / fsync-off cluster in place: rows kept, durable settings, password required", async () => {
    const port = await freePort();
    // The old scripts' cluster: trust authentication, fast settings, a row that must survive.
    expect(ensureCluster(pgBin, dataDir)).toBe(true);
    startCluster(pgBin, dataDir, port);
    expect(psql(port, "show fsync")).toBe("off");
    psql(port, "create table bench_note (id int primary key, text text); insert into bench_note values (1, 'Colpitts 455 kHz')");
    stopCluster(pgBin, dataDir);

    expect(secureCluster(pgBin, dataDir, passwordFile)).toBe("upgraded");
    expect(statSync(passwordFile).mode & 0o777).toBe(0o600);
    const { password } = clusterPassword(passwordFile);
    expect(password).toBe(readFileSync(passwordFile, "utf8").trim());
    expect(password.length).toBeGreaterThanOrEqual(32);
    startCluster(pgBin, dataDir, port, { durable: true });

    expect(refusal(port)).toMatch(/no password supplied/);
    expect(refusal(port, "not-the-password")).toMatch(/password authentication failed for user "postgres"/);
    for (const setting of ["fsync", "synchronous_commit", "full_page_writes"]) {
      expect(psql(port, `show ${setting}`, password), setting).toBe("on");
    }
    expect(psql(port, "show password_encryption", password)).toBe("scram-sha-256");
    expect(psql(port, "select text from bench_note where id = 1", password)).toBe("Colpitts 455 kHz");

    // A second start finds everything in place and changes nothing.
    stopCluster(pgBin, dataDir);
    expect(secureCluster(pgBin, dataDir, passwordFile)).toBe("unchanged");
    startCluster(pgBin, dataDir, port, { durable: true });
    expect(psql(port, "select count(*) from bench_note", password)).toBe("1");
    expect(refusal(port)).toMatch(/no password supplied/);
  });
});
