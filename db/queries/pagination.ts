import type { Knex } from "knex";
import { BadRequestError } from "@/lib/errors";

/** One page of a list, newest first; `nextCursor` is null on the last page. */
export interface Page<T> {
  items: T[];
  nextCursor: string | null;
}

export interface PageRequest {
  /** Opaque cursor from a previous page's nextCursor. */
  cursor?: string | null;
  /** 1..200; default 50. */
  limit?: number;
}

export const MAX_PAGE_LIMIT = 200;
export const DEFAULT_PAGE_LIMIT = 50;

interface CursorKey {
  /** created_at with microseconds, UTC ISO text (a JS Date would drop the microseconds and skip rows). */
  ts: string;
  id: string;
}

const UUID_RULE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;
const TS_RULE = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{6}Z$/;

/** SQL for the cursor column of `table`; select it as `cursor_ts` next to the row. */
export function cursorColumn(knex: Knex, table: string): Knex.Raw {
  return knex.raw(`to_char(??.created_at at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US"Z"') as cursor_ts`, [table]);
}

export function decodeCursor(cursor: string): CursorKey {
  try {
    const parsed = JSON.parse(Buffer.from(cursor, "base64url").toString("utf8")) as unknown;
    if (Array.isArray(parsed) && parsed.length === 2 && TS_RULE.test(String(parsed[0])) && UUID_RULE.test(String(parsed[1]))) {
      return { ts: String(parsed[0]), id: String(parsed[1]) };
    }
  } catch {
    // Fall through to the one message below: a cursor is opaque, its parts mean nothing to the caller.
  }
  throw new BadRequestError("cursor is not one this API gave out; start again without it", { cursor: ["unknown cursor"] });
}

function encodeCursor(key: CursorKey): string {
  return Buffer.from(JSON.stringify([key.ts, key.id]), "utf8").toString("base64url");
}

/** Applies newest-first order, the cursor and limit+1 to a query on `table` (aliased or not). */
export function paginate<Q extends Knex.QueryBuilder>(query: Q, table: string, page: PageRequest): Q {
  const limit = clampLimit(page.limit);
  if (page.cursor) {
    const key = decodeCursor(page.cursor);
    query.whereRaw(`(??.created_at, ??.id) < (?::timestamptz, ?::uuid)`, [table, table, key.ts, key.id]);
  }
  query.orderBy(`${table}.created_at`, "desc").orderBy(`${table}.id`, "desc").limit(limit + 1);
  return query;
}

export function clampLimit(limit: number | undefined): number {
  if (limit === undefined || !Number.isFinite(limit)) return DEFAULT_PAGE_LIMIT;
  return Math.min(MAX_PAGE_LIMIT, Math.max(1, Math.floor(limit)));
}

/** Cuts the extra row fetched by {@link paginate} and builds the next cursor from the last row kept. */
export function toPage<R extends { id: string; cursor_ts: string }, T>(rows: R[], page: PageRequest, map: (row: R) => T): Page<T> {
  const limit = clampLimit(page.limit);
  const kept = rows.slice(0, limit);
  const last = kept[kept.length - 1];
  return {
    items: kept.map(map),
    nextCursor: rows.length > limit && last ? encodeCursor({ ts: last.cursor_ts, id: last.id }) : null,
  };
}

/** Escapes LIKE wildcards in a search text. */
export function likePattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, "\\$&")}%`;
}

/** node-pg returns bigint as text; our sizes fit a double exactly (below 2^53). */
export function toNumber(value: string | number | null): number | null {
  return value === null ? null : Number(value);
}
