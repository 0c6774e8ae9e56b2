import type { Knex } from "knex";

// Read directly (not through lib/env) so the migration CLI works without the app's other settings.
const config: Knex.Config = {
  client: "pg",
  connection: process.env.DATABASE_URL ?? "postgres://postgres@127.0.0.1:54329/tankbook",
  pool: { min: 0, max: Number(process.env.DB_POOL_MAX ?? 10) },
  // The directory settings serve `knex migrate:make`; running migrations goes through db/migration-source.ts.
  migrations: { directory: "./migrations", extension: "ts", loadExtensions: [".ts"], tableName: "knex_migrations" },
};

export default config;
