import type { Knex } from "knex";

// Every spec check of a run's latest analysis, passed ones too (flags keep only the broken rules), so the run
// page can read the verdict line by line; and the in-record drift the checks used.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("runs", (t) => {
    t.jsonb("spec_checks").nullable();
    t.double("in_record_drift_ppm").nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("runs", (t) => {
    t.dropColumn("in_record_drift_ppm");
    t.dropColumn("spec_checks");
  });
}
