import knex, { type Knex } from "knex";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import config from "../../knexfile";
import { migrationSource } from "../../db/migration-source";

// Runs against a scratch database on the test cluster so the shared test database keeps its schema.
const scratchDb = "tankbook_migrations_check";
const source = { migrationSource: migrationSource() };
let admin: Knex;
let scratch: Knex;

beforeAll(async () => {
  const base = new URL(process.env.DATABASE_URL ?? "");
  admin = knex({ client: "pg", connection: base.toString() });
  await admin.raw(`drop database if exists ${scratchDb} with (force)`);
  await admin.raw(`create database ${scratchDb}`);
  base.pathname = `/${scratchDb}`;
  scratch = knex({ ...config, connection: base.toString() });
});

afterAll(async () => {
  await scratch?.destroy();
  await admin?.raw(`drop database if exists ${scratchDb} with (force)`);
  await admin?.destroy();
});

async function userTables(k: Knex): Promise<string[]> {
  const r = await k.raw(
    "select table_name from information_schema.tables where table_schema = 'public' and table_name not like 'knex_%' order by 1",
  );
  return r.rows.map((row: { table_name: string }) => row.table_name);
}

describe("migrations", () => {
  it("apply to an empty database", async () => {
    const [, applied] = await scratch.migrate.latest(source);
    expect(applied.length).toBeGreaterThan(0);
    expect(await userTables(scratch)).toContain("audit_events");
    const [done, pending] = await scratch.migrate.list(source);
    expect(pending).toHaveLength(0);
    expect(done.length).toBe(applied.length);
  });

  it("roll back cleanly, leaving no table behind", async () => {
    await scratch.migrate.rollback(source, true);
    expect(await userTables(scratch)).toEqual([]);
  });

  it("apply again after a full rollback", async () => {
    const [, applied] = await scratch.migrate.latest(source);
    expect(applied.length).toBeGreaterThan(0);
  });
});
