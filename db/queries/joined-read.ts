import type { Knex } from "knex";
import { db } from "../index";

// A read that can ride in the statement of a one-row lookup made for the same request (an API token's owner in
// api-tokens.ts): the read's rows are laterally joined to that row, so the request costs one round trip to
// PostgreSQL instead of two. The rows are only read when the lookup finds its row (an unknown token reads nothing).

/** Rows of one kind plus a few once-computed columns, mapped to what the caller wants. */
export interface JoinedRead<T> {
  /** The read's rows; each must carry a non-null `id`, since the join turns "no row" into one row of nulls. */
  rows: (knex: Knex) => Knex.QueryBuilder;
  /** Columns computed once beside the rows (e.g. whether the parent exists); names apart from the rows' own. */
  scalars?: (knex: Knex) => Record<string, Knex.Raw>;
  /** The rows' order, given again outside the join: SQL does not promise that a subquery's order survives it. */
  orderBy?: [column: string, order: "asc" | "desc"][];
  map(rows: Record<string, any>[], scalars: Record<string, any>): T;
}

/**
 * Runs `read` joined to `head` (a query of at most one row whose columns are named `h_*`) as one statement.
 * @returns the head's columns and the read's result, or null when the head found no row (nothing was read then)
 */
export async function readJoinedTo<T>(head: Knex.QueryBuilder, read: JoinedRead<T>, trx: Knex | Knex.Transaction = db()): Promise<{ head: Record<string, any>; data: T } | null> {
  const knex = trx as Knex;
  const scalars = read.scalars?.(knex) ?? {};
  for (const [name, sql] of Object.entries(scalars)) head.select(knex.raw(`? as ??`, [sql, name]));
  // knex compiles a query builder given as a binding into its parenthesised SQL; its types only name Raw.
  const statement = knex.select("h.*", "d.*").from(head.as("h")).joinRaw("left join lateral ? as d on true", [read.rows(knex) as unknown as Knex.Raw]);
  for (const [column, order] of read.orderBy ?? []) statement.orderBy(`d.${column}`, order);
  const rows: Record<string, any>[] = await statement;
  if (rows.length === 0) return null;
  const headColumns: Record<string, any> = {};
  const scalarValues: Record<string, any> = {};
  for (const key of Object.keys(rows[0])) {
    if (key.startsWith("h_")) headColumns[key] = rows[0][key];
    else if (Object.hasOwn(scalars, key)) scalarValues[key] = rows[0][key];
  }
  return { head: headColumns, data: read.map(rows.filter((r) => r.id !== null && r.id !== undefined), scalarValues) };
}

/** The read on its own (a session-authenticated request), still one statement. */
export async function runJoinedRead<T>(read: JoinedRead<T>, trx: Knex | Knex.Transaction = db()): Promise<T> {
  const knex = trx as Knex;
  return (await readJoinedTo(knex.select(knex.raw("true as h_alone")), read, trx))!.data;
}
