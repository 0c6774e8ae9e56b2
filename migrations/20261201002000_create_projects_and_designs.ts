import type { Knex } from "knex";

// Projects hold designs; a design's parts and spec live in numbered revisions so that editing a design never
// rewrites what earlier runs were measured against.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("projects", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("name").notNullable();
    t.text("purpose").notNullable().defaultTo("");
    t.text("owner_id").notNullable().references("id").inTable("auth_user");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["created_at", "id"]);
    t.index(["owner_id"]);
  });
  await knex.raw("create unique index projects_name_unique on projects (lower(name))");

  await knex.schema.createTable("designs", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("project_id").notNullable().references("id").inTable("projects").onDelete("CASCADE");
    t.text("name").notNullable();
    t.text("topology").notNullable().checkIn(["tank", "colpitts", "hartley", "clapp"], "designs_topology_check");
    t.integer("current_revision").notNullable().defaultTo(1);
    t.text("created_by").notNullable().references("id").inTable("auth_user");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["project_id", "created_at"]);
  });
  await knex.raw("create unique index designs_project_name_unique on designs (project_id, lower(name))");

  await knex.schema.createTable("design_revisions", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("design_id").notNullable().references("id").inTable("designs").onDelete("CASCADE");
    t.integer("revision").notNullable();
    // { [ref]: { valueSi, tolerance?, tempcoPpmPerK?, tempcoSpreadPpmPerK? } } — lib/oscillator's PartSpec.
    t.jsonb("components").notNullable();
    t.double("extra_capacitance_f").nullable();
    t.text("windings").nullable().checkIn(["aiding", "opposing"], "design_revisions_windings_check");
    // { targetHz, toleranceValue, toleranceUnit, maxThdPercent, maxHarmonicDbc, minFundamentalVpk, maxDriftPpm }.
    t.jsonb("spec").notNullable().defaultTo("{}");
    t.text("change_note").notNullable().defaultTo("");
    t.text("created_by").notNullable().references("id").inTable("auth_user");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(["design_id", "revision"], { indexName: "design_revisions_design_revision_unique" });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("design_revisions");
  await knex.schema.dropTable("designs");
  await knex.schema.dropTable("projects");
}
