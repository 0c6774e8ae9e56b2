import type { Knex } from "knex";
import { db } from "../index";

/** How the retune card aims: the build's own measurement, or the lab's figure for its construction. */
export const RETUNE_AIMS = ["measured", "lab"] as const;
export type RetuneAim = (typeof RETUNE_AIMS)[number];

export async function getRetuneAim(userId: string, trx: Knex | Knex.Transaction = db()): Promise<RetuneAim> {
  const row = await trx("user_retune_preferences").where({ user_id: userId }).first<{ aim: RetuneAim } | undefined>("aim");
  return row?.aim ?? "measured";
}

export async function setRetuneAim(userId: string, aim: RetuneAim, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("user_retune_preferences").insert({ user_id: userId, aim, updated_at: trx.fn.now() }).onConflict("user_id").merge();
}
