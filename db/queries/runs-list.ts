// A build's runs, newest first, filtered and paginated.
import type { Knex } from "knex";
import { db } from "../index";
import type { JoinedRead } from "./joined-read";
import { cursorColumn, paginate, toPage, type Page, type PageRequest } from "./pagination";
import { summaryColumns, toSummary, type RunRow, type RunSnapshot, type RunStatus, type RunSummary, type Verdict } from "./run-rows";

export interface RunFilter extends PageRequest {
  verdict?: Verdict | "none";
  status?: RunStatus;
  /** Created at or after. */
  from?: Date;
  /** Created before. */
  to?: Date;
}

/**
 * Applies the runs table's verdict, status and time filters to a query on `runs as r`; shared with the CSV
 * export so the file holds the rows the table shows.
 */
export function whereRunFilter<Q extends Knex.QueryBuilder>(query: Q, filter: Omit<RunFilter, "cursor" | "limit">): Q {
  if (filter.verdict === "none") query.whereNull("r.verdict");
  else if (filter.verdict) query.where("r.verdict", filter.verdict);
  if (filter.status) query.where("r.status", filter.status);
  if (filter.from) query.where("r.created_at", ">=", filter.from);
  if (filter.to) query.where("r.created_at", "<", filter.to);
  return query;
}

/** A build's runs, newest first. */
function buildRunsQuery(trx: Knex | Knex.Transaction, buildId: string, filter: RunFilter, extraColumns: string[]) {
  const query = trx("runs as r")
    .join("auth_user as u", "u.id", "r.created_by")
    .select(...summaryColumns, ...extraColumns, "u.name as created_by_name", cursorColumn(trx as Knex, "r"))
    .where("r.build_id", buildId);
  return paginate(whereRunFilter(query, filter), "r", filter);
}

/**
 * {@link listRuns} as a read that can join the caller's token lookup (joined-read.ts), with whether the build
 * exists (an empty page of an unknown build is a 404, of a known one an empty list).
 */
export function runsListRead(buildId: string, filter: RunFilter = {}): JoinedRead<{ page: Page<RunSummary>; buildExists: boolean }> {
  return {
    rows: (knex) => buildRunsQuery(knex, buildId, filter, []),
    scalars: (knex) => ({ build_exists: knex.raw("exists (select 1 from builds where id = ?)", [buildId]) }),
    orderBy: [
      ["created_at", "desc"],
      ["id", "desc"],
    ],
    map: (rows, scalars) => ({ page: toPage(rows as (RunRow & { cursor_ts: string })[], filter, toSummary), buildExists: scalars.build_exists === true }),
  };
}

export async function listRuns(buildId: string, filter: RunFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<Page<RunSummary>> {
  const rows = await buildRunsQuery(trx, buildId, filter, []);
  return toPage(rows as (RunRow & { cursor_ts: string })[], filter, toSummary);
}

/** {@link listRuns} with each run's snapshot (the prediction, bands and spec it was judged against), in one query. */
export async function listRunsWithSnapshot(
  buildId: string,
  filter: RunFilter = {},
  trx: Knex | Knex.Transaction = db(),
): Promise<Page<RunSummary & { snapshot: RunSnapshot }>> {
  const rows = await buildRunsQuery(trx, buildId, filter, ["r.snapshot"]);
  return toPage(rows as (RunRow & { cursor_ts: string })[], filter, (row) => ({ ...toSummary(row), snapshot: row.snapshot }));
}
