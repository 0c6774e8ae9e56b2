import type { Knex } from "knex";

// Personal API tokens for bench scripts: shown once, stored only as SHA-256, act with the owner's role.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("api_tokens", (t) => {
    t.text("id").primary();
    t.text("user_id").notNullable().references("id").inTable("auth_user").onDelete("CASCADE");
    t.text("name").notNullable();
    t.text("token_hash").notNullable().unique();
    /** The first characters of the token, so a person can tell their tokens apart; not enough to use it. */
    t.text("token_prefix").notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("last_used_at", { useTz: true }).nullable();
    t.timestamp("revoked_at", { useTz: true }).nullable();
    t.index(["user_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("api_tokens");
}
