import type { Knex } from "knex";

// The foundation's table: every later mutation writes one row here (who, what, which entity, when, from where).
export async function up(knex: Knex): Promise<void> {
  await knex.raw("create extension if not exists citext");
  await knex.schema.createTable("audit_events", (t) => {
    t.bigIncrements("id").primary();
    t.text("actor_id").nullable();
    t.text("action").notNullable();
    t.text("entity_type").nullable();
    t.text("entity_id").nullable();
    t.jsonb("detail").notNullable().defaultTo("{}");
    t.text("ip").nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["created_at"]);
    t.index(["actor_id", "created_at"]);
    t.index(["entity_type", "entity_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("audit_events");
}
