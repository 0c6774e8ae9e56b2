import type { Knex } from "knex";

// One row per build and spec rule whose failure has been e-mailed to the build's followers. While the row
// exists, further failing runs of that rule send nothing; it is deleted when a later run passes the rule,
// so the next failure e-mails again.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("alert_state", (t) => {
    t.uuid("build_id").notNullable().references("id").inTable("builds").onDelete("CASCADE");
    t.text("rule").notNullable();
    // The run whose flag was e-mailed; kept when the run is deleted so the rule stays quiet.
    t.uuid("run_id").nullable().references("id").inTable("runs").onDelete("SET NULL");
    t.timestamp("alerted_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(["build_id", "rule"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("alert_state");
}
