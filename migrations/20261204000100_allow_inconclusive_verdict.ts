import type { Knex } from "knex";

// A run whose spec cannot be judged on its capture (a harmonic that cannot be separated, a limit
// under the noise floor, no tone at all) is neither a pass nor a fail.
export async function up(knex: Knex): Promise<void> {
  await knex.raw("alter table runs drop constraint runs_verdict_check");
  await knex.raw("alter table runs add constraint runs_verdict_check check (verdict in ('pass', 'fail', 'inconclusive'))");
}

export async function down(knex: Knex): Promise<void> {
  // An inconclusive run is not a pass: going back, it becomes a fail rather than losing its row.
  await knex("runs").where({ verdict: "inconclusive" }).update({ verdict: "fail" });
  await knex.raw("alter table runs drop constraint runs_verdict_check");
  await knex.raw("alter table runs add constraint runs_verdict_check check (verdict in ('pass', 'fail'))");
}
