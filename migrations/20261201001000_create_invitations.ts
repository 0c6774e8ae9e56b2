import type { Knex } from "knex";

// An admin's invitation by e-mail: only the SHA-256 of the link's token is stored. Accepting creates the account.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("invitations", (t) => {
    t.text("id").primary();
    t.specificType("email", "citext").notNullable();
    t.text("role").notNullable().checkIn(["viewer", "technician", "engineer", "admin"], "invitations_role_check");
    t.text("token_hash").notNullable().unique();
    t.text("invited_by").nullable().references("id").inTable("auth_user").onDelete("SET NULL");
    t.timestamp("expires_at", { useTz: true }).notNullable();
    t.timestamp("accepted_at", { useTz: true }).nullable();
    t.timestamp("revoked_at", { useTz: true }).nullable();
    t.timestamp("last_sent_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp("created_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(["email"]);
  });
  // At most one open invitation per address; resending replaces its token.
  await knex.raw(
    "create unique index invitations_one_open_per_email on invitations (email) where accepted_at is null and revoked_at is null",
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("invitations");
}
