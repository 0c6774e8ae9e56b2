import type { Knex } from "knex";
import { db } from "../index";

/** A change made to a build: a part value (partRef, from, to) or a free note, by someone, at a time. */
export interface Tweak {
  id: string;
  buildId: string;
  /** Null for a note-only tweak. */
  partRef: string | null;
  /** SI units of the part (F, H, or unitless for k). */
  fromValue: number | null;
  toValue: number | null;
  note: string;
  /** Planned tweaks (e.g. from a retune suggestion) have not changed the as-built values. */
  planned: boolean;
  createdBy: string;
  createdByName: string;
  createdAt: Date;
}

interface TweakRow {
  id: string;
  build_id: string;
  part_ref: string | null;
  from_value: number | null;
  to_value: number | null;
  note: string;
  planned: boolean;
  created_by: string;
  created_by_name: string;
  created_at: Date;
}

function toTweak(row: TweakRow): Tweak {
  return {
    id: row.id,
    buildId: row.build_id,
    partRef: row.part_ref,
    fromValue: row.from_value,
    toValue: row.to_value,
    note: row.note,
    planned: row.planned,
    createdBy: row.created_by,
    createdByName: row.created_by_name,
    createdAt: row.created_at,
  };
}

/** A tweak from a row that came as JSON (`row_to_json` of the tweak columns and created_by_name); times come as text. */
export function tweakFromJsonRow(row: Omit<TweakRow, "created_at"> & { created_at: string }): Tweak {
  return toTweak({ ...row, created_at: new Date(row.created_at) });
}

/** The SQL of a run's tweak as one JSON object (null without one), for a subquery on `runs as r`. */
export const RUN_TWEAK_JSON_SQL = `(select row_to_json(x)
  from (select t.*, tu.name as created_by_name from tweaks t join auth_user tu on tu.id = t.created_by where t.id = r.tweak_id) x)`;

function tweakQuery(trx: Knex | Knex.Transaction) {
  return trx("tweaks as t").join("auth_user as u", "u.id", "t.created_by").select("t.*", "u.name as created_by_name");
}

export async function getTweak(id: string, trx: Knex | Knex.Transaction = db()): Promise<Tweak | null> {
  const row = await tweakQuery(trx).where("t.id", id).first<TweakRow | undefined>();
  return row ? toTweak(row) : null;
}

/** A build's tweaks in time order (oldest first: the log reads top to bottom). */
export async function listTweaks(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<Tweak[]> {
  const rows: TweakRow[] = await tweakQuery(trx).where("t.build_id", buildId).orderBy("t.created_at").orderBy("t.id");
  return rows.map(toTweak);
}

export async function createTweak(
  input: {
    buildId: string;
    partRef: string | null;
    fromValue: number | null;
    toValue: number | null;
    note: string;
    planned: boolean;
    createdBy: string;
    /** For the demo seed's back-dated history; the database clock otherwise. */
    createdAt?: Date;
  },
  trx: Knex | Knex.Transaction = db(),
): Promise<Tweak> {
  const [{ id }] = await trx("tweaks")
    .insert({
      build_id: input.buildId,
      part_ref: input.partRef,
      from_value: input.fromValue,
      to_value: input.toValue,
      note: input.note,
      planned: input.planned,
      created_by: input.createdBy,
      ...(input.createdAt ? { created_at: input.createdAt } : {}),
    })
    .returning("id");
  return (await getTweak(id, trx))!;
}

/**
 * Marks a planned tweak as done (the caller applies its value to the build in the same transaction).
 * @param fromValue the part's value just before, SI units
 * @returns false when it was not planned (applied already)
 */
export async function markTweakApplied(id: string, fromValue: number | null, trx: Knex | Knex.Transaction = db()): Promise<boolean> {
  return (await trx("tweaks").where({ id, planned: true }).update({ planned: false, from_value: fromValue })) > 0;
}
