import type { Knex } from "knex";

// How a person's retune card aims for the target: with the capacitance the build's own latest run implies
// ("measured", the default and what the card always did) or with the lab's figure for the build's construction
// ("lab", the calibrated model). No row means the default.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable("user_retune_preferences", (t) => {
    t.text("user_id").primary().references("id").inTable("auth_user").onDelete("CASCADE");
    t.text("aim").notNullable().defaultTo("measured").checkIn(["measured", "lab"], "user_retune_preferences_aim_check");
    t.timestamp("updated_at", { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable("user_retune_preferences");
}
