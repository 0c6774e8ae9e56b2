// `npm run migrate -- latest|rollback|status|make NAME`: schema changes, only through migrations/.
import knex from "knex";
import config from "../knexfile";
import { migrationSource } from "../db/migration-source";

async function main(): Promise<number> {
  const [command = "latest", name] = process.argv.slice(2);
  const k = knex(config);
  const source = { migrationSource: migrationSource() };
  try {
    if (command === "latest") {
      const [batch, done] = await k.migrate.latest(source);
      console.log(done.length ? `migrated (batch ${batch}): ${done.join(", ")}` : "database schema is up to date");
    } else if (command === "rollback") {
      const [batch, undone] = await k.migrate.rollback(source, process.argv.includes("--all"));
      console.log(undone.length ? `rolled back batch ${batch}: ${undone.join(", ")}` : "nothing to roll back");
    } else if (command === "status") {
      const [done, pending] = await k.migrate.list(source);
      console.log(`applied: ${done.length}, pending: ${pending.length}`);
    } else if (command === "make" && name) {
      console.log(await k.migrate.make(name, { extension: "ts" }));
    } else {
      console.error("usage: npm run migrate -- latest | rollback [--all] | status | make NAME");
      return 2;
    }
    return 0;
  } catch (err) {
    console.error(`migration failed: ${err instanceof Error ? err.message : String(err)}`);
    return 1;
  } finally {
    await k.destroy();
  }
}

main().then((code) => process.exit(code));
