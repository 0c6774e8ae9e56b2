import type { Knex } from "knex";

// Which builds' spec flags a person is e-mailed about. No row means the default ("my-builds").
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("notification_preferences", (t) => {
    t.text("user_id").primary().references("id").inTable("auth_user").onDelete("CASCADE");
    t.text("flag_emails")
      .notNullable()
      .defaultTo("my-builds")
      .checkIn(["none", "my-builds", "all"], "notification_preferences_flag_emails_check");
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("notification_preferences");
}
