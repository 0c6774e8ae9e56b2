// A scratch database (migrated) on the test cluster and a bucket of our own on the stack's fake S3, so these
// tests own their queue: the worker `npm test` runs beside the app watches the shared test database, not this one.
// Call `useScratchStack()` at the top of a test file, before importing anything that reads the environment.
import { randomBytes } from "node:crypto";
import knex from "knex";
import { generateIdFromEntropySize } from "lucia";

export interface ScratchStack {
  databaseUrl: string;
  bucket: string;
  /** Drops the database (after the file's connections are closed). */
  drop(): Promise<void>;
}

function baseUrl(): URL {
  const url = process.env.DATABASE_URL;
  if (!url) throw new Error("DATABASE_URL is not set: run through `npm test`, or point it at a PostgreSQL cluster you own");
  return new URL(url);
}

/** Points process.env at a fresh scratch database and bucket (settings for a fast queue included). */
export async function useScratchStack(name: string): Promise<ScratchStack> {
  const base = baseUrl();
  const database = `tankbook_it_${name}_${randomBytes(3).toString("hex")}`;
  const admin = knex({ client: "pg", connection: base.toString() });
  await admin.raw(`create database ${database}`);
  await admin.destroy();
  const url = new URL(base.toString());
  url.pathname = `/${database}`;
  const bucket = `logbook-it-${randomBytes(3).toString("hex")}`;
  const settings: Record<string, string> = {
    DATABASE_URL: url.toString(),
    S3_BUCKET: bucket,
    // Small numbers so a lost job is retried within seconds (the queue takes them when it is first created).
    ANALYSIS_JOB_TIMEOUT_SECONDS: "4",
    ANALYSIS_RETRY_DELAY_SECONDS: "1",
    ANALYSIS_MAINTENANCE_SECONDS: "1",
    ANALYSIS_POLL_SECONDS: "0.5",
    ANALYSIS_THREADS: "1",
  };
  // Put back what was there when the file is done, so no later test file in this process lands in our database.
  const previous = Object.fromEntries(Object.keys(settings).map((k) => [k, process.env[k]]));
  Object.assign(process.env, settings);
  const { migrationSource } = await import("@/db/migration-source");
  const k = knex({ client: "pg", connection: url.toString() });
  await k.migrate.latest({ migrationSource: migrationSource() });
  await k.destroy();
  const { ensureBucket } = await import("@/lib/storage");
  await ensureBucket();
  return {
    databaseUrl: url.toString(),
    bucket,
    async drop() {
      for (const [k, v] of Object.entries(previous)) {
        if (v === undefined) delete process.env[k];
        else process.env[k] = v;
      }
      const a = knex({ client: "pg", connection: base.toString() });
      await a.raw(`drop database if exists ${database} with (force)`);
      await a.destroy();
    },
  };
}

/** A person made straight in the scratch database, as the app's user type. */
export async function scratchUser(role: "viewer" | "technician" | "engineer" | "admin") {
  const { createUser } = await import("@/db/queries/users");
  const user = await createUser({
    id: generateIdFromEntropySize(10),
    email: `${role}-${randomBytes(4).toString("hex")}@logbook-tests.test`,
    name: `Test ${role}`,
    role,
    passwordHash: null,
  });
  return { id: user.id, email: user.email, name: user.name, role: user.role };
}

/** Polls until `check` returns a value (not undefined), or fails after `timeoutMs`. */
export async function waitFor<T>(what: string, check: () => Promise<T | undefined>, timeoutMs = 30_000, everyMs = 200): Promise<T> {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const value = await check();
    if (value !== undefined) return value;
    if (Date.now() > until) throw new Error(`timed out after ${timeoutMs} ms waiting for ${what}`);
    await new Promise((r) => setTimeout(r, everyMs));
  }
}
