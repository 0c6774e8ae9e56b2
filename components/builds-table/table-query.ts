import { buildTableQuerySchema, type BuildTableQuery as ParsedQuery } from "@/lib/validations/review";
import type { BuildTableSort } from "@/db/queries/dashboard";

// The build table keeps its whole state in the URL (filters, sort, page), so a view can be bookmarked, shared and
// reloaded, and the table works without JavaScript. On a page with other lists the keys take a prefix
// ("b_state=flagged"), leaving the page's own parameters alone.

/** The query keys the table owns, without their prefix. */
export const TABLE_KEYS = ["q", "state", "kind", "sort", "dir", "page", "pageSize"] as const;
type TableKey = (typeof TABLE_KEYS)[number];

/** The table's query; every key optional (absent means the default). */
export type BuildTableQuery = Partial<ParsedQuery>;

export type SearchParams = Record<string, string | string[] | undefined>;

/** The table's parsed query, and the message of a part of it that was refused (the rest still applies). */
export interface TableQueryState {
  query: BuildTableQuery;
  error: string | null;
}

/** Direction a column sorts first: numbers and times biggest first, names A to Z. */
export function firstDirection(sort: BuildTableSort): "asc" | "desc" {
  return sort === "label" || sort === "state" ? "asc" : "desc";
}

/**
 * Reads the table's part of a page's search params with {@link buildTableQuerySchema}. A key that fails its rule
 * is dropped (the table falls back to its default for it) and its message is returned.
 *
 * @param params - the page's search params.
 * @param prefix - the table's key prefix ("" or e.g. "b_").
 */
export function parseTableQuery(params: SearchParams, prefix = ""): TableQueryState {
  const raw: Partial<Record<TableKey, string | string[]>> = {};
  for (const key of TABLE_KEYS) {
    const v = params[`${prefix}${key}`];
    if (v !== undefined) raw[key] = key === "state" ? v : Array.isArray(v) ? v[0] : v;
  }
  const parsed = buildTableQuerySchema.safeParse(raw);
  if (parsed.success) return { query: parsed.data, error: null };
  const bad = new Set(parsed.error.issues.map((i) => String(i.path[0])));
  const kept = Object.fromEntries(Object.entries(raw).filter(([k]) => !bad.has(k)));
  const retry = buildTableQuerySchema.safeParse(kept);
  return { query: retry.success ? retry.data : {}, error: parsed.error.issues.map((i) => i.message).join(" ") };
}

/** The table's query as URL parameters (prefixed), defaults left out. */
export function tableParams(query: BuildTableQuery, prefix = ""): Record<string, string> {
  const out: Record<string, string> = {};
  if (query.q) out[`${prefix}q`] = query.q;
  if (query.state && query.state.length > 0) out[`${prefix}state`] = query.state.join(",");
  if (query.kind) out[`${prefix}kind`] = query.kind;
  if (query.sort) out[`${prefix}sort`] = query.sort;
  if (query.dir) out[`${prefix}dir`] = query.dir;
  if (query.page && query.page > 1) out[`${prefix}page`] = String(query.page);
  if (query.pageSize) out[`${prefix}pageSize`] = String(query.pageSize);
  return out;
}

/**
 * A link to the same page with the table's query changed.
 *
 * @param basePath - the page's path.
 * @param keep - the page's other parameters, kept as they are.
 * @param query - the table's query now.
 * @param patch - what changes; a filter or sort change goes back to page 1 unless `page` is given.
 * @param prefix - the table's key prefix.
 */
export function tableHref(basePath: string, keep: Record<string, string>, query: BuildTableQuery, patch: Partial<BuildTableQuery>, prefix = ""): string {
  const next: BuildTableQuery = { ...query, ...patch };
  if (!("page" in patch)) delete next.page;
  const params = new URLSearchParams({ ...keep, ...tableParams(next, prefix) });
  const s = params.toString();
  return s ? `${basePath}?${s}` : basePath;
}

/** The link a column header points at: sort by it, or flip the direction when it already sorts. */
export function sortHref(basePath: string, keep: Record<string, string>, query: BuildTableQuery, sort: BuildTableSort, prefix = ""): string {
  const active = (query.sort ?? "created") === sort;
  const current = query.dir ?? firstDirection(query.sort ?? "created");
  const dir = active ? (current === "asc" ? "desc" : "asc") : firstDirection(sort);
  return tableHref(basePath, keep, query, { sort, dir }, prefix);
}

/** The page's parameters that are not the table's, as plain strings (first value of repeated keys). */
export function otherParams(params: SearchParams, prefix = ""): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(params)) {
    const own = TABLE_KEYS.some((key) => k === `${prefix}${key}`);
    if (own || v === undefined) continue;
    const value = Array.isArray(v) ? v[0] : v;
    if (value !== undefined && value !== "") out[k] = value;
  }
  return out;
}
