import type { Knex } from "knex";

// Sign-off details beside the logbook's review columns: the reason an engineer gave for accepting a build whose
// latest run was flagged, and the run the decision was made against (the report prints both).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("builds", (t) => {
    t.text("review_reason").nullable();
    t.uuid("reviewed_run_id").nullable().references("id").inTable("runs").onDelete("SET NULL");
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("builds", (t) => {
    t.dropColumn("reviewed_run_id");
    t.dropColumn("review_reason");
  });
}
