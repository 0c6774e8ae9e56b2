import type { Knex } from "knex";

// Users and lucia's sessions. Invitations, resets, tokens and throttling come in later migrations.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("auth_user", (t) => {
    t.text("id").primary();
    t.specificType("email", "citext").notNullable().unique();
    t.text("name").notNullable();
    t.text("password_hash").nullable();
    t.text("role").notNullable().checkIn(["viewer", "technician", "engineer", "admin"], "auth_user_role_check");
    t.text("status").notNullable().defaultTo("active").checkIn(["active", "disabled"], "auth_user_status_check");
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("last_seen_at", { useTz: true }).nullable();
  });
  await knex.schema.createTable("user_session", (t) => {
    t.text("id").primary();
    t.text("user_id").notNullable().references("id").inTable("auth_user").onDelete("CASCADE");
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text("ip").nullable();
    t.text("user_agent").nullable();
    t.index(["user_id"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("user_session");
  await knex.schema.dropTable("auth_user");
}
