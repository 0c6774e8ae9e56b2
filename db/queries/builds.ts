import type { Knex } from "knex";
import type { Topology, WindingSense } from "@/lib/oscillator/design";
import type { Parts } from "./designs";
import { db } from "../index";
import { flagFromJsonRow, type Flag } from "./flags";
import type { JoinedRead } from "./joined-read";
import { tweakFromJsonRow, type Tweak } from "./tweaks";
import type { Verdict } from "./runs";
import { cursorColumn, likePattern, paginate, toNumber, toPage, type Page, type PageRequest } from "./pagination";

export const BUILD_KINDS = ["breadboard", "perfboard", "pcb", "other"] as const;
export type BuildKind = (typeof BUILD_KINDS)[number];
export const BUILD_STATUSES = ["open", "accepted", "rejected"] as const;
export type BuildStatus = (typeof BUILD_STATUSES)[number];

export interface Build {
  id: string;
  designId: string;
  designName: string;
  projectId: string;
  projectName: string;
  /** The design revision the build was made from. */
  designRevisionId: string;
  label: string;
  kind: BuildKind;
  /** Free text beside the kind, e.g. "rev B" for a PCB. */
  kindRevision: string;
  builtBy: string;
  builtByName: string;
  /** Parts as they are on the bench now (the design's values, changed by every applied tweak). */
  asBuilt: Parts;
  status: BuildStatus;
  /** Accuracy of the scope's timebase on this bench, ± ppm; null when nobody has entered it. */
  timebasePpm: number | null;
  reviewComment: string | null;
  reviewedBy: string | null;
  reviewedByName: string | null;
  reviewedAt: Date | null;
  createdBy: string;
  createdAt: Date;
  updatedAt: Date;
}

/** The latest run of a build, as its list row shows it. */
export interface LatestRun {
  id: string;
  createdAt: Date;
  status: string;
  measuredHz: number | null;
  driftPpm: number | null;
  thdPercent: number | null;
  verdict: Verdict | null;
}

export interface BuildSummary extends Build {
  runCount: number;
  latestRun: LatestRun | null;
}

interface BuildRow {
  id: string;
  design_id: string;
  design_name: string;
  project_id: string;
  project_name: string;
  design_revision_id: string;
  label: string;
  kind: BuildKind;
  kind_revision: string;
  built_by: string;
  built_by_name: string;
  as_built: Parts;
  status: BuildStatus;
  timebase_ppm: number | null;
  review_comment: string | null;
  reviewed_by: string | null;
  reviewed_by_name: string | null;
  reviewed_at: Date | null;
  created_by: string;
  created_at: Date;
  updated_at: Date;
}

function toBuild(row: BuildRow): Build {
  return {
    id: row.id,
    designId: row.design_id,
    designName: row.design_name,
    projectId: row.project_id,
    projectName: row.project_name,
    designRevisionId: row.design_revision_id,
    label: row.label,
    kind: row.kind,
    kindRevision: row.kind_revision,
    builtBy: row.built_by,
    builtByName: row.built_by_name,
    asBuilt: row.as_built,
    status: row.status,
    timebasePpm: row.timebase_ppm,
    reviewComment: row.review_comment,
    reviewedBy: row.reviewed_by,
    reviewedByName: row.reviewed_by_name,
    reviewedAt: row.reviewed_at,
    createdBy: row.created_by,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function buildQuery(trx: Knex | Knex.Transaction) {
  return trx("builds as b")
    .join("designs as d", "d.id", "b.design_id")
    .join("projects as p", "p.id", "d.project_id")
    .join("auth_user as bu", "bu.id", "b.built_by")
    .leftJoin("auth_user as rv", "rv.id", "b.reviewed_by")
    .select("b.*", "d.name as design_name", "d.project_id", "p.name as project_name", "bu.name as built_by_name", "rv.name as reviewed_by_name");
}

export async function getBuild(id: string, trx: Knex | Knex.Transaction = db()): Promise<Build | null> {
  const row = await buildQuery(trx).where("b.id", id).first<BuildRow | undefined>();
  return row ? toBuild(row) : null;
}

/** What `GET /api/v1/builds/{id}` shows: the build, what its prediction needs of the design, tweaks, open flags. */
export interface BuildDetail {
  build: Build;
  topology: Topology;
  /** The design's current revision's extra capacitance and windings (the prediction's other inputs). */
  extraCapacitanceF: number | null;
  windings: WindingSense | null;
  /** Oldest first, as the log reads. */
  tweaks: Tweak[];
  /** Not yet acknowledged, newest first. */
  openFlags: Flag[];
}

// The build's tweaks and open flags as JSON arrays in the orders listTweaks and listBuildFlags give them, so the
// detail is one statement instead of six.
const BUILD_TWEAKS_JSON_SQL = `(select coalesce(json_agg(x order by x.created_at, x.id), '[]'::json)
  from (select t.*, tu.name as created_by_name from tweaks t join auth_user tu on tu.id = t.created_by where t.build_id = b.id) x)`;
const BUILD_OPEN_FLAGS_JSON_SQL = `(select coalesce(json_agg(x order by x.created_at desc, x.rule), '[]'::json)
  from (select f.*, fu.name as acknowledged_by_name from flags f left join auth_user fu on fu.id = f.acknowledged_by
        where f.build_id = b.id and f.acknowledged_at is null) x)`;

/** The build detail as a read that can join the caller's token lookup (joined-read.ts); null for an unknown build. */
export function buildDetailRead(id: string): JoinedRead<BuildDetail | null> {
  return {
    rows: (knex) =>
      buildQuery(knex)
        .join("design_revisions as dr", (j) => j.on("dr.design_id", "d.id").andOn("dr.revision", "d.current_revision"))
        .select(
          "d.topology as design_topology",
          "dr.extra_capacitance_f as design_extra_capacitance_f",
          "dr.windings as design_windings",
          knex.raw(`${BUILD_TWEAKS_JSON_SQL} as tweak_rows`),
          knex.raw(`${BUILD_OPEN_FLAGS_JSON_SQL} as open_flag_rows`),
        )
        .where("b.id", id),
    map: ([row]) =>
      row
        ? {
            build: toBuild(row as BuildRow),
            topology: row.design_topology,
            extraCapacitanceF: row.design_extra_capacitance_f,
            windings: row.design_windings,
            tweaks: row.tweak_rows.map(tweakFromJsonRow),
            openFlags: row.open_flag_rows.map(flagFromJsonRow),
          }
        : null,
  };
}

/** The build row locked for update, inside a transaction (tweaks and uploads read-modify-write its parts). */
export async function getBuildForUpdate(id: string, trx: Knex.Transaction): Promise<Build | null> {
  await trx("builds").where({ id }).forUpdate().first("id");
  return getBuild(id, trx);
}

export interface BuildFilter extends PageRequest {
  q?: string;
  status?: BuildStatus;
  kind?: BuildKind;
}

/** A design's builds, newest first, with run count and latest run. */
export async function listBuilds(designId: string, filter: BuildFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<Page<BuildSummary>> {
  const query = buildQuery(trx)
    .select(cursorColumn(trx as Knex, "b"))
    .select(
      trx.raw("(select count(*)::int from runs r where r.build_id = b.id) as run_count"),
      trx.raw(`(select jsonb_build_object('id', r.id, 'createdAt', r.created_at, 'status', r.status, 'measuredHz', r.measured_hz,
                 'driftPpm', r.drift_ppm, 'thdPercent', r.thd_percent, 'verdict', r.verdict)
               from runs r where r.build_id = b.id and r.withdrawn_at is null order by r.created_at desc, r.id desc limit 1) as latest_run`),
    )
    .where("b.design_id", designId);
  if (filter.q) query.whereILike("b.label", likePattern(filter.q));
  if (filter.status) query.where("b.status", filter.status);
  if (filter.kind) query.where("b.kind", filter.kind);
  const rows = await paginate(query, "b", filter);
  return toPage(rows, filter, (r) => ({
    ...toBuild(r),
    runCount: r.run_count,
    latestRun: r.latest_run ? { ...r.latest_run, createdAt: new Date(r.latest_run.createdAt) } : null,
  }));
}

export async function createBuild(
  input: {
    designId: string;
    designRevisionId: string;
    label: string;
    kind: BuildKind;
    kindRevision: string;
    builtBy: string;
    asBuilt: Parts;
    createdBy: string;
    /** For the demo seed's back-dated history; the database clock otherwise. */
    createdAt?: Date;
  },
  trx: Knex | Knex.Transaction = db(),
): Promise<Build> {
  const [{ id }] = await trx("builds")
    .insert({
      design_id: input.designId,
      design_revision_id: input.designRevisionId,
      label: input.label,
      kind: input.kind,
      kind_revision: input.kindRevision,
      built_by: input.builtBy,
      as_built: JSON.stringify(input.asBuilt),
      created_by: input.createdBy,
      ...(input.createdAt ? { created_at: input.createdAt, updated_at: input.createdAt } : {}),
    })
    .returning("id");
  return (await getBuild(id, trx))!;
}

export async function updateBuildAsBuilt(id: string, asBuilt: Parts, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("builds").where({ id }).update({ as_built: JSON.stringify(asBuilt), updated_at: trx.fn.now() });
}

/** Sets (or clears, with null) the build's scope timebase accuracy. */
export async function updateBuildTimebase(id: string, timebasePpm: number | null, trx: Knex | Knex.Transaction = db()): Promise<Build | null> {
  const count = await trx("builds").where({ id }).update({ timebase_ppm: timebasePpm, updated_at: trx.fn.now() });
  return count ? getBuild(id, trx) : null;
}

export async function updateBuildReview(
  id: string,
  input: { status: BuildStatus; comment: string | null; reviewedBy: string | null },
  trx: Knex | Knex.Transaction = db(),
): Promise<Build | null> {
  const count = await trx("builds")
    .where({ id })
    .update({
      status: input.status,
      review_comment: input.comment,
      reviewed_by: input.reviewedBy,
      reviewed_at: input.reviewedBy ? trx.fn.now() : null,
      updated_at: trx.fn.now(),
    });
  return count ? getBuild(id, trx) : null;
}

export interface BuildPhoto {
  id: string;
  buildId: string;
  objectKey: string;
  contentType: string;
  sizeBytes: number;
  caption: string;
  uploadedBy: string;
  createdAt: Date;
}

interface PhotoRow {
  id: string;
  build_id: string;
  object_key: string;
  content_type: string;
  size_bytes: string;
  caption: string;
  uploaded_by: string;
  created_at: Date;
}

function toPhoto(row: PhotoRow): BuildPhoto {
  return {
    id: row.id,
    buildId: row.build_id,
    objectKey: row.object_key,
    contentType: row.content_type,
    sizeBytes: toNumber(row.size_bytes) ?? 0,
    caption: row.caption,
    uploadedBy: row.uploaded_by,
    createdAt: row.created_at,
  };
}

export async function listBuildPhotos(buildId: string, trx: Knex | Knex.Transaction = db()): Promise<BuildPhoto[]> {
  const rows: PhotoRow[] = await trx("build_photos").where({ build_id: buildId }).orderBy("created_at");
  return rows.map(toPhoto);
}

export async function createBuildPhoto(
  input: { id?: string; buildId: string; objectKey: string; contentType: string; sizeBytes: number; caption: string; uploadedBy: string },
  trx: Knex | Knex.Transaction = db(),
): Promise<BuildPhoto> {
  const [row]: PhotoRow[] = await trx("build_photos")
    .insert({
      ...(input.id ? { id: input.id } : {}),
      build_id: input.buildId,
      object_key: input.objectKey,
      content_type: input.contentType,
      size_bytes: input.sizeBytes,
      caption: input.caption,
      uploaded_by: input.uploadedBy,
    })
    .returning("*");
  return toPhoto(row);
}
