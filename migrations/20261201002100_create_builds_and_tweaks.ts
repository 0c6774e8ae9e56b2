import type { Knex } from "knex";

// A build is one physical prototype of a design. Its as-built parts start as the design's and change with
// every applied tweak; photos are objects in storage, referenced by key.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("builds", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("design_id").notNullable().references("id").inTable("designs").onDelete("CASCADE");
    // The revision the build was made from; the spec a run is judged by is the design's revision at upload.
    t.uuid("design_revision_id").notNullable().references("id").inTable("design_revisions");
    t.text("label").notNullable();
    t.text("kind").notNullable().checkIn(["breadboard", "perfboard", "pcb", "other"], "builds_kind_check");
    t.text("kind_revision").notNullable().defaultTo("");
    t.text("built_by").notNullable().references("id").inTable("auth_user");
    t.jsonb("as_built").notNullable();
    t.text("status").notNullable().defaultTo("open").checkIn(["open", "accepted", "rejected"], "builds_status_check");
    t.text("review_comment").nullable();
    t.text("reviewed_by").nullable().references("id").inTable("auth_user");
    t.timestamp("reviewed_at", { useTz: true }).nullable();
    t.text("created_by").notNullable().references("id").inTable("auth_user");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["design_id", "created_at"]);
  });
  await knex.raw("create unique index builds_design_label_unique on builds (design_id, lower(label))");

  await knex.schema.createTable("build_photos", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("build_id").notNullable().references("id").inTable("builds").onDelete("CASCADE");
    t.text("object_key").notNullable().unique();
    t.text("content_type").notNullable();
    t.bigInteger("size_bytes").notNullable();
    t.text("caption").notNullable().defaultTo("");
    t.text("uploaded_by").notNullable().references("id").inTable("auth_user");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["build_id", "created_at"]);
  });

  await knex.schema.createTable("tweaks", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.uuid("build_id").notNullable().references("id").inTable("builds").onDelete("CASCADE");
    // Null for a free note ("moved the probe ground"); otherwise the part that changed and its values in SI units.
    t.text("part_ref").nullable();
    t.double("from_value").nullable();
    t.double("to_value").nullable();
    t.text("note").notNullable().defaultTo("");
    // A planned tweak (e.g. a retune suggestion) has not touched the as-built values yet.
    t.boolean("planned").notNullable().defaultTo(false);
    t.text("created_by").notNullable().references("id").inTable("auth_user");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["build_id", "created_at"]);
  });
  await knex.raw(
    "alter table tweaks add constraint tweaks_part_values_check check (part_ref is null or to_value is not null)",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("tweaks");
  await knex.schema.dropTable("build_photos");
  await knex.schema.dropTable("builds");
}
