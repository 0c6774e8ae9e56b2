import type { Knex } from "knex";

// The accuracy of the scope's timebase on this build's bench, in ppm (from its data sheet or calibration): part of
// an absolute frequency's uncertainty that no capture can show. Null until someone enters it.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("builds", (t) => {
    t.double("timebase_ppm").nullable();
  });
  await knex.raw("alter table builds add constraint builds_timebase_ppm_check check (timebase_ppm is null or (timebase_ppm >= 0 and timebase_ppm <= 10000))");
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable("builds", (t) => {
    t.dropColumn("timebase_ppm");
  });
}
