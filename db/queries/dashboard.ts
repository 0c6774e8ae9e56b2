import type { Knex } from "knex";
import type { BuildKind, BuildStatus } from "./builds";
import type { RunStatus, Verdict } from "./runs";
import { db } from "../index";
import { likePattern } from "./pagination";

// Builds as the dashboard, project and design pages list them: each with its state and the numbers of its latest
// analysed run. The state is computed in SQL so the lists can filter, sort and page on it on the server.

/**
 * A build's state. accepted / rejected come from the sign-off; otherwise it is read from the latest analysed run
 * that is not withdrawn:
 * flagged (verdict fail), cannot-judge (inconclusive: no rule failed but one could not be decided on the capture),
 * in-spec (pass), unchecked (runs exist but none analysed with a verdict yet — queued, failed, or a design without
 * limits), no-runs.
 */
export const BUILD_STATES = ["no-runs", "unchecked", "in-spec", "cannot-judge", "flagged", "accepted", "rejected"] as const;
export type BuildState = (typeof BUILD_STATES)[number];

export const BUILD_TABLE_SORTS = ["created", "label", "state", "measuredHz", "driftPpm", "absDriftPpm", "thdPercent", "latestRunAt", "runCount"] as const;
export type BuildTableSort = (typeof BUILD_TABLE_SORTS)[number];

export interface BuildTableRow {
  id: string;
  label: string;
  kind: BuildKind;
  kindRevision: string;
  status: BuildStatus;
  state: BuildState;
  designId: string;
  designName: string;
  projectId: string;
  projectName: string;
  builtBy: string;
  builtByName: string;
  createdAt: Date;
  runCount: number;
  /** The latest analysed run (status done); null when none. */
  latestRun: {
    id: string;
    createdAt: Date;
    measuredHz: number | null;
    frequencyUncertaintyHz: number | null;
    driftPpm: number | null;
    thdPercent: number | null;
    worstHarmonicDbc: number | null;
    verdict: Verdict | null;
    /** The worst-case prediction band at that run's upload, Hz. */
    worstCase: { minHz: number; maxHz: number } | null;
    /** True when the measured frequency lies outside the worst-case band. */
    outsideBand: boolean;
  } | null;
}

export interface BuildTableFilter {
  projectId?: string;
  designId?: string;
  /** Label contains (case-insensitive). */
  q?: string;
  state?: BuildState | BuildState[];
  kind?: BuildKind;
  /** Builds this person created or built, or follows (build or project, unless they unfollowed the build). */
  involving?: string;
  /** Open builds whose latest analysed run is flagged or measured outside its worst-case band. */
  needsAttention?: boolean;
  sort?: BuildTableSort;
  direction?: "asc" | "desc";
  /** 1-based. */
  page?: number;
  /** 1..200; default 25. */
  pageSize?: number;
}

export interface NumberedPage<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
  pageCount: number;
}

export const DEFAULT_TABLE_PAGE_SIZE = 25;
export const MAX_TABLE_PAGE_SIZE = 200;

const STATE_SQL = `case
  when b.status = 'accepted' then 'accepted'
  when b.status = 'rejected' then 'rejected'
  when not exists (select 1 from runs r0 where r0.build_id = b.id) then 'no-runs'
  when lr.verdict = 'fail' then 'flagged'
  when lr.verdict = 'pass' then 'in-spec'
  when lr.verdict = 'inconclusive' then 'cannot-judge'
  else 'unchecked' end`;

// Order of states when sorting by state: what needs a look first.
const STATE_RANK_SQL = `case t.state when 'flagged' then 0 when 'cannot-judge' then 1 when 'unchecked' then 2 when 'in-spec' then 3 when 'no-runs' then 4 when 'accepted' then 5 else 6 end`;

const SORT_SQL: Record<BuildTableSort, string> = {
  created: "t.created_at",
  label: "lower(t.label)",
  state: STATE_RANK_SQL,
  measuredHz: "t.lr_measured_hz",
  driftPpm: "t.lr_drift_ppm",
  absDriftPpm: "abs(t.lr_drift_ppm)",
  thdPercent: "t.lr_thd_percent",
  latestRunAt: "t.lr_created_at",
  runCount: "t.run_count",
};

function buildTableBase(trx: Knex | Knex.Transaction) {
  return trx("builds as b")
    .join("designs as d", "d.id", "b.design_id")
    .join("projects as p", "p.id", "d.project_id")
    .join("auth_user as bu", "bu.id", "b.built_by")
    .joinRaw(
      `left join lateral (
         select r.id, r.created_at, r.measured_hz, r.frequency_uncertainty_hz, r.drift_ppm, r.thd_percent,
                r.worst_harmonic_dbc, r.verdict,
                (r.snapshot->'worstCase'->>'minHz')::float8 as band_min_hz,
                (r.snapshot->'worstCase'->>'maxHz')::float8 as band_max_hz
         from runs r where r.build_id = b.id and r.status = 'done' and r.withdrawn_at is null
         order by r.created_at desc, r.id desc limit 1) lr on true`,
    )
    .select(
      "b.id",
      "b.label",
      "b.kind",
      "b.kind_revision",
      "b.status",
      "b.design_id",
      "d.name as design_name",
      "d.project_id",
      "p.name as project_name",
      "b.built_by",
      "bu.name as built_by_name",
      "b.created_by",
      "b.created_at",
      trx.raw("(select count(*)::int from runs rc where rc.build_id = b.id) as run_count"),
      "lr.id as lr_id",
      "lr.created_at as lr_created_at",
      "lr.measured_hz as lr_measured_hz",
      "lr.frequency_uncertainty_hz as lr_frequency_uncertainty_hz",
      "lr.drift_ppm as lr_drift_ppm",
      "lr.thd_percent as lr_thd_percent",
      "lr.worst_harmonic_dbc as lr_worst_harmonic_dbc",
      "lr.verdict as lr_verdict",
      "lr.band_min_hz as lr_band_min_hz",
      "lr.band_max_hz as lr_band_max_hz",
      trx.raw(`(${STATE_SQL}) as state`),
      trx.raw("coalesce(lr.measured_hz < lr.band_min_hz or lr.measured_hz > lr.band_max_hz, false) as outside_band"),
    );
}

interface BuildTableDbRow {
  id: string;
  label: string;
  kind: BuildKind;
  kind_revision: string;
  status: BuildStatus;
  design_id: string;
  design_name: string;
  project_id: string;
  project_name: string;
  built_by: string;
  built_by_name: string;
  created_at: Date;
  run_count: number;
  lr_id: string | null;
  lr_created_at: Date | null;
  lr_measured_hz: number | null;
  lr_frequency_uncertainty_hz: number | null;
  lr_drift_ppm: number | null;
  lr_thd_percent: number | null;
  lr_worst_harmonic_dbc: number | null;
  lr_verdict: Verdict | null;
  lr_band_min_hz: number | null;
  lr_band_max_hz: number | null;
  state: BuildState;
  outside_band: boolean;
  total_count?: string;
}

function toRow(r: BuildTableDbRow): BuildTableRow {
  return {
    id: r.id,
    label: r.label,
    kind: r.kind,
    kindRevision: r.kind_revision,
    status: r.status,
    state: r.state,
    designId: r.design_id,
    designName: r.design_name,
    projectId: r.project_id,
    projectName: r.project_name,
    builtBy: r.built_by,
    builtByName: r.built_by_name,
    createdAt: r.created_at,
    runCount: r.run_count,
    latestRun: r.lr_id
      ? {
          id: r.lr_id,
          createdAt: r.lr_created_at!,
          measuredHz: r.lr_measured_hz,
          frequencyUncertaintyHz: r.lr_frequency_uncertainty_hz,
          driftPpm: r.lr_drift_ppm,
          thdPercent: r.lr_thd_percent,
          worstHarmonicDbc: r.lr_worst_harmonic_dbc,
          verdict: r.lr_verdict,
          worstCase: r.lr_band_min_hz !== null && r.lr_band_max_hz !== null ? { minHz: r.lr_band_min_hz, maxHz: r.lr_band_max_hz } : null,
          outsideBand: r.outside_band,
        }
      : null,
  };
}

function clampPageSize(size: number | undefined): number {
  if (size === undefined || !Number.isFinite(size)) return DEFAULT_TABLE_PAGE_SIZE;
  return Math.min(MAX_TABLE_PAGE_SIZE, Math.max(1, Math.floor(size)));
}

function clampPage(page: number | undefined): number {
  if (page === undefined || !Number.isFinite(page)) return 1;
  return Math.max(1, Math.floor(page));
}

/**
 * Builds with their state and latest analysed numbers, filtered, sorted and paged on the server (numbered pages,
 * because the tables sort on any column). Nulls sort last whichever the direction; ties break on newest first.
 *
 * @param filter - scope (project, design, a person's builds), search, state, kind, attention, sort and page
 * @returns one page and the total count of matching builds
 */
export async function listBuildTable(filter: BuildTableFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<NumberedPage<BuildTableRow>> {
  const pageSize = clampPageSize(filter.pageSize);
  const page = clampPage(filter.page);
  const inner = buildTableBase(trx);
  if (filter.projectId) inner.where("d.project_id", filter.projectId);
  if (filter.designId) inner.where("b.design_id", filter.designId);
  if (filter.q) inner.whereILike("b.label", likePattern(filter.q));
  if (filter.kind) inner.where("b.kind", filter.kind);
  if (filter.involving) {
    const userId = filter.involving;
    inner.where((q) =>
      q
        .where("b.created_by", userId)
        .orWhere("b.built_by", userId)
        .orWhereExists((e) => e.from("follows as f").whereRaw("f.build_id = b.id").where({ "f.user_id": userId, "f.following": true }))
        .orWhere((w) =>
          w
            .whereExists((e) => e.from("follows as f").whereRaw("f.project_id = d.project_id").where({ "f.user_id": userId, "f.following": true }))
            .whereNotExists((e) => e.from("follows as f").whereRaw("f.build_id = b.id").where({ "f.user_id": userId, "f.following": false })),
        ),
    );
  }

  const outer = trx.from(inner.as("t")).select("t.*", trx.raw("count(*) over () as total_count"));
  const states = filter.state === undefined ? [] : ([] as BuildState[]).concat(filter.state);
  if (states.length > 0) outer.whereIn("t.state", states);
  if (filter.needsAttention) outer.where("t.status", "open").where((q) => q.where("t.state", "flagged").orWhere("t.outside_band", true));
  const direction = filter.direction === "asc" ? "asc" : "desc";
  outer.orderByRaw(`${SORT_SQL[filter.sort ?? "created"]} ${direction} nulls last`).orderBy("t.created_at", "desc").orderBy("t.id", "desc");
  outer.limit(pageSize).offset((page - 1) * pageSize);

  const rows: BuildTableDbRow[] = await outer;
  let total = rows.length > 0 ? Number(rows[0].total_count) : 0;
  if (rows.length === 0 && page > 1) {
    // Past the last page: the window count has no row to ride on, so count on its own.
    const counted = trx.from(inner.clone().as("t"));
    if (states.length > 0) counted.whereIn("t.state", states);
    if (filter.needsAttention) counted.where("t.status", "open").where((q) => q.where("t.state", "flagged").orWhere("t.outside_band", true));
    const [{ n }] = await counted.count<{ n: string }[]>({ n: "*" });
    total = Number(n);
  }
  return { items: rows.map(toRow), total, page, pageSize, pageCount: Math.max(1, Math.ceil(total / pageSize)) };
}

/** A build that needs a look, with the reasons and its latest run's failing rules. */
export interface AttentionBuild extends BuildTableRow {
  reasons: ("flagged" | "outside-band")[];
  /** Rules the latest analysed run broke. */
  failingRules: string[];
  /** Flags on any of its runs nobody has acknowledged yet. */
  unacknowledgedFlagCount: number;
}

/**
 * Open builds needing attention: the latest analysed run is flagged, or measured outside the worst-case band of
 * its prediction. Most recently measured first.
 */
export async function listBuildsNeedingAttention(
  options: { projectId?: string; limit?: number } = {},
  trx: Knex | Knex.Transaction = db(),
): Promise<AttentionBuild[]> {
  const page = await listBuildTable({ projectId: options.projectId, needsAttention: true, sort: "latestRunAt", direction: "desc", pageSize: options.limit ?? 20 }, trx);
  if (page.items.length === 0) return [];
  const buildIds = page.items.map((b) => b.id);
  const runIds = page.items.map((b) => b.latestRun?.id).filter((id): id is string => Boolean(id));
  const [failing, unacked] = await Promise.all([
    trx("flags").whereIn("run_id", runIds).select("run_id", "rule").orderBy("rule"),
    trx("flags").whereIn("build_id", buildIds).whereNull("acknowledged_at").groupBy("build_id").select("build_id").count<{ build_id: string; n: string }[]>({ n: "*" }),
  ]);
  const rulesByRun = new Map<string, string[]>();
  for (const f of failing as { run_id: string; rule: string }[]) rulesByRun.set(f.run_id, [...(rulesByRun.get(f.run_id) ?? []), f.rule]);
  const unackedByBuild = new Map(unacked.map((u) => [u.build_id, Number(u.n)]));
  return page.items.map((b) => ({
    ...b,
    reasons: [...(b.state === "flagged" ? (["flagged"] as const) : []), ...(b.latestRun?.outsideBand ? (["outside-band"] as const) : [])],
    failingRules: b.latestRun ? (rulesByRun.get(b.latestRun.id) ?? []) : [],
    unacknowledgedFlagCount: unackedByBuild.get(b.id) ?? 0,
  }));
}

/** The builds a person made or follows, most recently measured first. */
export async function listMyBuilds(userId: string, options: { limit?: number } = {}, trx: Knex | Knex.Transaction = db()): Promise<BuildTableRow[]> {
  const page = await listBuildTable({ involving: userId, sort: "latestRunAt", direction: "desc", pageSize: options.limit ?? 20 }, trx);
  return page.items;
}

/** A run across all projects, as the dashboard lists it. */
export interface DashboardRun {
  id: string;
  createdAt: Date;
  status: RunStatus;
  originalFilename: string;
  measuredHz: number | null;
  frequencyUncertaintyHz: number | null;
  driftPpm: number | null;
  thdPercent: number | null;
  worstHarmonicDbc: number | null;
  verdict: Verdict | null;
  buildId: string;
  buildLabel: string;
  designId: string;
  designName: string;
  projectId: string;
  projectName: string;
  createdByName: string;
}

/** The newest runs across every project (any status, so captures still analysing show). */
export async function listLatestRuns(options: { limit?: number; projectId?: string } = {}, trx: Knex | Knex.Transaction = db()): Promise<DashboardRun[]> {
  const q = trx("runs as r")
    .join("builds as b", "b.id", "r.build_id")
    .join("designs as d", "d.id", "b.design_id")
    .join("projects as p", "p.id", "d.project_id")
    .join("auth_user as u", "u.id", "r.created_by")
    .select(
      "r.id",
      "r.created_at",
      "r.status",
      "r.original_filename",
      "r.measured_hz",
      "r.frequency_uncertainty_hz",
      "r.drift_ppm",
      "r.thd_percent",
      "r.worst_harmonic_dbc",
      "r.verdict",
      "b.id as build_id",
      "b.label as build_label",
      "d.id as design_id",
      "d.name as design_name",
      "p.id as project_id",
      "p.name as project_name",
      "u.name as created_by_name",
    )
    .orderBy("r.created_at", "desc")
    .orderBy("r.id", "desc")
    .limit(clampPageSize(options.limit ?? 20));
  if (options.projectId) q.where("d.project_id", options.projectId);
  const rows = await q;
  return rows.map((r) => ({
    id: r.id,
    createdAt: r.created_at,
    status: r.status,
    originalFilename: r.original_filename,
    measuredHz: r.measured_hz,
    frequencyUncertaintyHz: r.frequency_uncertainty_hz,
    driftPpm: r.drift_ppm,
    thdPercent: r.thd_percent,
    worstHarmonicDbc: r.worst_harmonic_dbc,
    verdict: r.verdict,
    buildId: r.build_id,
    buildLabel: r.build_label,
    designId: r.design_id,
    designName: r.design_name,
    projectId: r.project_id,
    projectName: r.project_name,
    createdByName: r.created_by_name,
  }));
}

/** Head counts for the dashboard: builds by state and runs in the last 7 days. */
export async function getDashboardCounts(trx: Knex | Knex.Transaction = db()): Promise<{ buildsByState: Record<BuildState, number>; needingAttention: number; runsLast7Days: number }> {
  const base = buildTableBase(trx);
  const [byState, attention, runs] = await Promise.all([
    trx.from(base.clone().as("t")).select("t.state").count<{ state: BuildState; n: string }[]>({ n: "*" }).groupBy("t.state"),
    trx
      .from(base.clone().as("t"))
      .where("t.status", "open")
      .where((q) => q.where("t.state", "flagged").orWhere("t.outside_band", true))
      .count<{ n: string }[]>({ n: "*" }),
    trx("runs").where("created_at", ">=", trx.raw("now() - interval '7 days'")).count<{ n: string }[]>({ n: "*" }),
  ]);
  const buildsByState = Object.fromEntries(BUILD_STATES.map((s) => [s, 0])) as Record<BuildState, number>;
  for (const r of byState) buildsByState[r.state] = Number(r.n);
  return { buildsByState, needingAttention: Number(attention[0].n), runsLast7Days: Number(runs[0].n) };
}

/** One build as the tables show it (state, latest analysed run), or null when there is no such build. */
export async function getBuildTableRow(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<BuildTableRow | null> {
  const row = await buildTableBase(trx).where("b.id", buildId).first<BuildTableDbRow | undefined>();
  return row ? toRow(row) : null;
}
