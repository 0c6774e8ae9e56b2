import { readdirSync } from "node:fs";
import path from "node:path";
import type { Knex } from "knex";

interface MigrationModule {
  up(knex: Knex): Promise<void>;
  down(knex: Knex): Promise<void>;
}

/**
 * Lists migrations/ and loads each file with the caller's own `import()`, so the TypeScript files load
 * the same way under tsx (scripts) and under vitest (tests); knex's built-in loader only knows Node's.
 */
export function migrationSource(directory = path.join(process.cwd(), "migrations")): Knex.MigrationSource<string> {
  return {
    async getMigrations() {
      return readdirSync(directory)
        .filter((f) => /^\d{14}_[a-z0-9_]+\.ts$/.test(f))
        .sort();
    },
    getMigrationName(name) {
      return name;
    },
    async getMigration(name) {
      return (await import(/* @vite-ignore */ path.join(directory, name))) as MigrationModule;
    },
  };
}
