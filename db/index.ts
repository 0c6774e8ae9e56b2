import knex, { type Knex } from "knex";
import config from "../knexfile";

// One Knex instance per process. Cached on globalThis so that Next's dev reloads do not open a new pool
// per edit; keyed on the URL so tests that point DATABASE_URL elsewhere get their own.
const globalForDb = globalThis as unknown as { tankbookDb?: { url: string; db: Knex } };

export function db(): Knex {
  const url = process.env.DATABASE_URL ?? String(config.connection);
  if (globalForDb.tankbookDb?.url !== url) {
    globalForDb.tankbookDb = { url, db: knex({ ...config, connection: url }) };
  }
  return globalForDb.tankbookDb.db;
}

/** Closes the pool (scripts and tests call this before exiting). */
export async function closeDb(): Promise<void> {
  const cached = globalForDb.tankbookDb;
  globalForDb.tankbookDb = undefined;
  if (cached) await cached.db.destroy();
}
