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

/** `head` (a query of at most one row) with the read's scalars and rows joined to it; `h_*` columns are the head's. */
export function joinedStatement(knex: Knex, head: Knex.QueryBuilder, read: JoinedRead<unknown>): Knex.QueryBuilder {
  const scalars = read.scalars?.(knex) ?? {};
  for (const [name, sql] of Object.entries(scalars)) head.select(knex.raw(`? as ??`, [sql, name]));
  // knex compiles a query builder given as a binding into its parenthesised SQL; its types only name Raw.
  const statement = knex.select("h.*", "d.*").from(head.as("h")).joinRaw("left join lateral ? as d on true", [read.rows(knex) as unknown as Knex.Raw]);
  for (const [column, order] of read.orderBy ?? []) statement.orderBy(`d.${column}`, order);
  return statement;
}

/**
 * Splits a joined statement's rows into the head's columns (named `h_*`, taken from the first row) and the read's
 * result. @returns null when the head found no row
 */
export function splitJoined<T>(rows: Record<string, any>[], read: JoinedRead<T>, scalarNames: string[]): { head: Record<string, any>; data: T } | null {
  if (rows.length === 0) return null;
  const first = rows[0];
  const head: Record<string, any> = {};
  const scalars: Record<string, any> = {};
  for (const key of Object.keys(first)) {
    if (key.startsWith("h_")) head[key] = first[key];
    else if (scalarNames.includes(key)) scalars[key] = first[key];
  }
  return { head, data: read.map(rows.filter((r) => r.id !== null && r.id !== undefined), scalars) };
}

/** The read on its own (a session-authenticated request), still one statement. */
export async function runJoinedRead<T>(read: JoinedRead<T>, trx: Knex | Knex.Transaction = db()): Promise<T> {
  const knex = trx as Knex;
  const rows = await joinedStatement(knex, knex.select(knex.raw("true as h_alone")), read);
  return splitJoined(rows, read, Object.keys(read.scalars?.(knex) ?? {}))!.data;
}
