import type { Knex } from "knex";

// Writes through /api/v1 per user and minute, so the limit holds across several web servers.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("api_write_counts", (t) => {
    t.text("user_id").notNullable().references("id").inTable("auth_user").onDelete("CASCADE");
    t.timestamp("window_start", { useTz: true }).notNullable();
    t.integer("count").notNullable().defaultTo(0);
    t.primary(["user_id", "window_start"]);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("api_write_counts");
}
