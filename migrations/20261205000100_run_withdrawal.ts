import type { Knex } from "knex";

// A run can be withdrawn (a wrong probe setting, the wrong board on the bench) without deleting it: the capture,
// its analysis and its history stay, but the lab's aggregates, the build's drift trend and verdict and the
// comparison's default run leave it out. Restoring clears the three columns; the audit log keeps both events.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable("runs", (t) => {
    t.timestamp("withdrawn_at", { useTz: true }).nullable();
    t.text("withdrawn_by").nullable().references("id").inTable("auth_user");
    t.text("withdrawal_reason").nullable();
  });
  // All three or none: a withdrawal always says who and why.
  await knex.raw(
    `alter table runs add constraint runs_withdrawal_complete check (
       (withdrawn_at is null and withdrawn_by is null and withdrawal_reason is null)
       or (withdrawn_at is not null and withdrawn_by is not null and withdrawal_reason is not null and length(btrim(withdrawal_reason)) > 0))`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw("alter table runs drop constraint if exists runs_withdrawal_complete");
  await knex.schema.alterTable("runs", (t) => {
    t.dropColumn("withdrawal_reason");
    t.dropColumn("withdrawn_by");
    t.dropColumn("withdrawn_at");
  });
}
