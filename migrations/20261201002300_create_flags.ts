import type { Knex } from "knex";

// A spec rule one run broke: the measured value, the limit and by how much (margin, in the rule's unit).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("flags", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("run_id").notNullable().references("id").inTable("runs").onDelete("CASCADE");
    t.uuid("build_id").notNullable().references("id").inTable("builds").onDelete("CASCADE");
    t.text("rule").notNullable();
    t.double("measured").nullable();
    t.double("limit").nullable();
    t.double("margin").nullable();
    t.text("unit").notNullable().defaultTo("");
    t.text("message").notNullable();
    t.text("acknowledged_by").nullable().references("id").inTable("auth_user");
    t.timestamp("acknowledged_at", { useTz: true }).nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["run_id"]);
    t.index(["build_id", "rule", "created_at"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("flags");
}
