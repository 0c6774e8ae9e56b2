import type { Knex } from "knex";

// One capture of a build. The raw object stays in storage unchanged (key, SHA-256, size); the snapshot holds
// what the build was at upload (as-built parts, prediction, bands, spec) so later tweaks and design edits never
// change how an old run reads. Results live as jsonb for the pages and as columns for querying.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("runs", (t) => {
    t.uuid("id").primary();
    t.uuid("build_id").notNullable().references("id").inTable("builds").onDelete("CASCADE");
    t.uuid("design_revision_id").notNullable().references("id").inTable("design_revisions");
    t.uuid("tweak_id").nullable().references("id").inTable("tweaks").onDelete("SET NULL");
    t.text("object_key").notNullable().unique();
    t.text("sha256").notNullable();
    t.bigInteger("size_bytes").notNullable();
    t.text("original_filename").notNullable();
    t.text("channel").nullable();
    t.double("probe_attenuation").notNullable().defaultTo(1);
    t.double("supply_v").nullable();
    t.double("temperature_c").nullable();
    t.text("note").notNullable().defaultTo("");
    t.jsonb("snapshot").notNullable();
    t.double("predicted_hz").nullable();
    t.text("status").notNullable().defaultTo("queued").checkIn(["queued", "running", "done", "failed"], "runs_status_check");
    t.text("error").nullable();
    t.text("engine_version").nullable();
    t.jsonb("results").nullable();
    t.jsonb("plot").nullable();
    t.double("measured_hz").nullable();
    t.double("frequency_uncertainty_hz").nullable();
    t.double("drift_ppm").nullable();
    t.double("implied_extra_capacitance_f").nullable();
    t.double("fundamental_vpk").nullable();
    t.double("thd_percent").nullable();
    t.double("worst_harmonic_dbc").nullable();
    t.text("verdict").nullable().checkIn(["pass", "fail"], "runs_verdict_check");
    t.integer("attempts").notNullable().defaultTo(0);
    // Set when the user chose to keep a second copy of a capture already logged on this build.
    t.uuid("duplicate_of_run_id").nullable().references("id").inTable("runs").onDelete("SET NULL");
    t.text("created_by").notNullable().references("id").inTable("auth_user");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("started_at", { useTz: true }).nullable();
    t.timestamp("finished_at", { useTz: true }).nullable();
    t.index(["build_id", "created_at", "id"]);
    t.index(["verdict"]);
  });
  await knex.raw("alter table runs add constraint runs_sha256_check check (sha256 ~ '^[0-9a-f]{64}$')");
  // The same file twice on one build is a duplicate, unless the second copy was kept on purpose.
  await knex.raw(
    "create unique index runs_build_sha256_unique on runs (build_id, sha256) where duplicate_of_run_id is null",
  );
  await knex.raw("create index runs_unfinished on runs (status, updated_at) where status in ('queued', 'running')");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("runs");
}
