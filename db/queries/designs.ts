import type { Knex } from "knex";
import type { PartSpec, Topology, WindingSense } from "@/lib/oscillator/design";
import type { DesignSpec } from "@/lib/spec/types";
import { db } from "../index";
import { cursorColumn, likePattern, paginate, toPage, type Page, type PageRequest } from "./pagination";

/** Parts by reference (L, C1, …), values in SI units, tolerances as fractions. */
export type Parts = Record<string, PartSpec>;

/** One numbered state of a design: its parts, extra capacitance and spec. Never changed once written. */
export interface DesignRevision {
  id: string;
  designId: string;
  revision: number;
  parts: Parts;
  extraCapacitanceF: number | null;
  windings: WindingSense | null;
  spec: DesignSpec;
  changeNote: string;
  createdBy: string;
  createdByName: string;
  createdAt: Date;
}

export interface Design {
  id: string;
  projectId: string;
  projectName: string;
  name: string;
  topology: Topology;
  currentRevision: number;
  createdBy: string;
  createdAt: Date;
  updatedAt: Date;
  /** The current revision. */
  revision: DesignRevision;
}

/** A design with the counts its list row shows. */
export interface DesignSummary extends Design {
  buildCount: number;
  runCount: number;
}

interface RevisionRow {
  id: string;
  design_id: string;
  revision: number;
  components: Parts;
  extra_capacitance_f: number | null;
  windings: WindingSense | null;
  spec: DesignSpec;
  change_note: string;
  created_by: string;
  created_by_name: string;
  created_at: Date;
}

function toRevision(row: RevisionRow): DesignRevision {
  return {
    id: row.id,
    designId: row.design_id,
    revision: row.revision,
    parts: row.components,
    extraCapacitanceF: row.extra_capacitance_f,
    windings: row.windings,
    spec: row.spec,
    changeNote: row.change_note,
    createdBy: row.created_by,
    createdByName: row.created_by_name,
    createdAt: row.created_at,
  };
}

function revisionQuery(trx: Knex | Knex.Transaction) {
  return trx("design_revisions as r").join("auth_user as u", "u.id", "r.created_by").select("r.*", "u.name as created_by_name");
}

interface DesignRow {
  id: string;
  project_id: string;
  project_name: string;
  name: string;
  topology: Topology;
  current_revision: number;
  created_by: string;
  created_at: Date;
  updated_at: Date;
  rev: RevisionRow;
}

function designQuery(trx: Knex | Knex.Transaction) {
  return trx("designs as d")
    .join("projects as p", "p.id", "d.project_id")
    .join("design_revisions as r", (j) => j.on("r.design_id", "d.id").andOn("r.revision", "d.current_revision"))
    .join("auth_user as ru", "ru.id", "r.created_by")
    .select(
      "d.*",
      "p.name as project_name",
      trx.raw("to_jsonb(r) || jsonb_build_object('created_by_name', ru.name) as rev"),
    );
}

function toDesign(row: DesignRow): Design {
  const rev = row.rev as unknown as Record<string, unknown>;
  return {
    id: row.id,
    projectId: row.project_id,
    projectName: row.project_name,
    name: row.name,
    topology: row.topology,
    currentRevision: row.current_revision,
    createdBy: row.created_by,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
    // to_jsonb turns the timestamp into text; bring it back to a Date like every other time we return.
    revision: toRevision({ ...(rev as unknown as RevisionRow), created_at: new Date(String(rev.created_at)) }),
  };
}

export async function getDesign(id: string, trx: Knex | Knex.Transaction = db()): Promise<Design | null> {
  const row = await designQuery(trx).where("d.id", id).first<DesignRow | undefined>();
  return row ? toDesign(row) : null;
}

export interface DesignFilter extends PageRequest {
  q?: string;
  topology?: Topology;
}

/** A project's designs, newest first, with build and run counts. */
export async function listDesigns(projectId: string, filter: DesignFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<Page<DesignSummary>> {
  const query = designQuery(trx)
    .select(cursorColumn(trx as Knex, "d"))
    .select(
      trx.raw("(select count(*)::int from builds b where b.design_id = d.id) as build_count"),
      trx.raw("(select count(*)::int from runs x join builds b on b.id = x.build_id where b.design_id = d.id) as run_count"),
    )
    .where("d.project_id", projectId);
  if (filter.q) query.whereILike("d.name", likePattern(filter.q));
  if (filter.topology) query.where("d.topology", filter.topology);
  const rows = await paginate(query, "d", filter);
  return toPage(rows, filter, (r) => ({ ...toDesign(r), buildCount: r.build_count, runCount: r.run_count }));
}

export async function getDesignRevision(id: string, trx: Knex | Knex.Transaction = db()): Promise<DesignRevision | null> {
  const row = await revisionQuery(trx).where("r.id", id).first<RevisionRow | undefined>();
  return row ? toRevision(row) : null;
}

/** Every revision of a design, newest first (the history shown beside the design). */
export async function listDesignRevisions(designId: string, trx: Knex | Knex.Transaction = db()): Promise<DesignRevision[]> {
  const rows = await revisionQuery(trx).where("r.design_id", designId).orderBy("r.revision", "desc");
  return rows.map(toRevision);
}

export interface RevisionInput {
  parts: Parts;
  extraCapacitanceF: number | null;
  windings: WindingSense | null;
  spec: DesignSpec;
  changeNote: string;
  createdBy: string;
}

function revisionRow(designId: string, revision: number, input: RevisionInput) {
  return {
    design_id: designId,
    revision,
    components: JSON.stringify(input.parts),
    extra_capacitance_f: input.extraCapacitanceF,
    windings: input.windings,
    spec: JSON.stringify(input.spec),
    change_note: input.changeNote,
    created_by: input.createdBy,
  };
}

/** Creates a design with revision 1. Call inside a transaction so both rows land together. */
export async function createDesign(
  input: { projectId: string; name: string; topology: Topology; createdAt?: Date } & RevisionInput,
  trx: Knex | Knex.Transaction = db(),
): Promise<Design> {
  const at = input.createdAt ? { created_at: input.createdAt, updated_at: input.createdAt } : {};
  const [{ id }] = await trx("designs")
    .insert({ project_id: input.projectId, name: input.name, topology: input.topology, current_revision: 1, created_by: input.createdBy, ...at })
    .returning("id");
  await trx("design_revisions").insert({ ...revisionRow(id, 1, input), ...(input.createdAt ? { created_at: input.createdAt } : {}) });
  return (await getDesign(id, trx))!;
}

/**
 * Adds the next revision and makes it current; the design row is locked so two edits cannot take one number.
 * @returns the design with its new revision, or null when it does not exist
 */
export async function createDesignRevision(
  designId: string,
  input: RevisionInput & { name?: string },
  trx: Knex.Transaction,
): Promise<Design | null> {
  const current = await trx("designs").where({ id: designId }).forUpdate().first<{ current_revision: number } | undefined>();
  if (!current) return null;
  const next = current.current_revision + 1;
  await trx("design_revisions").insert(revisionRow(designId, next, input));
  const patch: Record<string, unknown> = { current_revision: next, updated_at: trx.fn.now() };
  if (input.name !== undefined) patch.name = input.name;
  await trx("designs").where({ id: designId }).update(patch);
  return getDesign(designId, trx);
}
