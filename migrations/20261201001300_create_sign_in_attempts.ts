import type { Knex } from "knex";

// Every sign-in attempt, so throttling per account and per client address holds across several web servers.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("sign_in_attempts", (t) => {
    t.bigIncrements("id").primary();
    t.specificType("email", "citext").notNullable();
    t.text("ip").nullable();
    t.boolean("succeeded").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["email", "created_at"]);
    t.index(["ip", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("sign_in_attempts");
}
