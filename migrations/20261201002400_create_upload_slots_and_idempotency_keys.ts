import type { Knex } from "knex";

// Upload slots: the server picks the object key (and the future run's id) before the browser PUTs the file,
// so a client can never choose where its bytes land. Idempotency keys let a bench script retry an upload.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("upload_slots", (t) => {
    t.uuid("id").primary().defaultTo(knex.raw("gen_random_uuid()"));
    t.text("purpose").notNullable().checkIn(["capture", "photo"], "upload_slots_purpose_check");
    t.text("object_key").notNullable().unique();
    // For a capture, the id the run will get; the object key is built from it.
    t.uuid("reserved_id").notNullable().unique();
    t.text("user_id").notNullable().references("id").inTable("auth_user").onDelete("CASCADE");
    t.uuid("build_id").notNullable().references("id").inTable("builds").onDelete("CASCADE");
    t.text("content_type").notNullable();
    t.bigInteger("size_bytes").notNullable();
    t.text("original_filename").notNullable();
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("completed_at", { useTz: true }).nullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["expires_at"]);
  });

  await knex.schema.createTable("api_idempotency_keys", (t) => {
    t.text("user_id").notNullable().references("id").inTable("auth_user").onDelete("CASCADE");
    t.text("key").notNullable();
    t.uuid("run_id").notNullable().references("id").inTable("runs").onDelete("CASCADE");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(["user_id", "key"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("api_idempotency_keys");
  await knex.schema.dropTable("upload_slots");
}
