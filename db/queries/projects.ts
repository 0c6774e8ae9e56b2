import type { Knex } from "knex";
import { db } from "../index";
import { cursorColumn, likePattern, paginate, toPage, type Page, type PageRequest } from "./pagination";

export interface Project {
  id: string;
  name: string;
  purpose: string;
  ownerId: string;
  ownerName: string;
  createdAt: Date;
  updatedAt: Date;
}

/** A project with the counts its list row shows. */
export interface ProjectSummary extends Project {
  designCount: number;
  buildCount: number;
  runCount: number;
  lastRunAt: Date | null;
}

interface ProjectRow {
  id: string;
  name: string;
  purpose: string;
  owner_id: string;
  owner_name: string;
  created_at: Date;
  updated_at: Date;
}

function toProject(row: ProjectRow): Project {
  return {
    id: row.id,
    name: row.name,
    purpose: row.purpose,
    ownerId: row.owner_id,
    ownerName: row.owner_name,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

function baseQuery(trx: Knex | Knex.Transaction) {
  return trx("projects as p").join("auth_user as u", "u.id", "p.owner_id").select("p.*", "u.name as owner_name");
}

export async function getProject(id: string, trx: Knex | Knex.Transaction = db()): Promise<Project | null> {
  const row = await baseQuery(trx).where("p.id", id).first<ProjectRow | undefined>();
  return row ? toProject(row) : null;
}

export interface ProjectFilter extends PageRequest {
  /** Matches name or purpose, case-insensitive. */
  q?: string;
  ownerId?: string;
}

/** Projects newest first with their design, build and run counts. */
export async function listProjects(filter: ProjectFilter = {}, trx: Knex | Knex.Transaction = db()): Promise<Page<ProjectSummary>> {
  const query = baseQuery(trx)
    .select(cursorColumn(trx as Knex, "p"))
    .select(
      trx.raw("(select count(*)::int from designs d where d.project_id = p.id) as design_count"),
      trx.raw("(select count(*)::int from builds b join designs d on d.id = b.design_id where d.project_id = p.id) as build_count"),
      trx.raw(
        "(select count(*)::int from runs r join builds b on b.id = r.build_id join designs d on d.id = b.design_id where d.project_id = p.id) as run_count",
      ),
      trx.raw(
        "(select max(r.created_at) from runs r join builds b on b.id = r.build_id join designs d on d.id = b.design_id where d.project_id = p.id) as last_run_at",
      ),
    );
  if (filter.q) query.where((w) => w.whereILike("p.name", likePattern(filter.q!)).orWhereILike("p.purpose", likePattern(filter.q!)));
  if (filter.ownerId) query.where("p.owner_id", filter.ownerId);
  const rows = await paginate(query, "p", filter);
  return toPage(rows, filter, (r) => ({
    ...toProject(r),
    designCount: r.design_count,
    buildCount: r.build_count,
    runCount: r.run_count,
    lastRunAt: r.last_run_at,
  }));
}

export async function getProjectByName(name: string, trx: Knex | Knex.Transaction = db()): Promise<Project | null> {
  const row = await baseQuery(trx).whereRaw("lower(p.name) = lower(?)", [name]).first<ProjectRow | undefined>();
  return row ? toProject(row) : null;
}

export async function createProject(
  input: { name: string; purpose: string; ownerId: string; createdAt?: Date },
  trx: Knex | Knex.Transaction = db(),
): Promise<Project> {
  const at = input.createdAt ? { created_at: input.createdAt, updated_at: input.createdAt } : {};
  const [{ id }] = await trx("projects").insert({ name: input.name, purpose: input.purpose, owner_id: input.ownerId, ...at }).returning("id");
  return (await getProject(id, trx))!;
}

export async function updateProject(
  id: string,
  input: { name?: string; purpose?: string; ownerId?: string },
  trx: Knex | Knex.Transaction = db(),
): Promise<Project | null> {
  const patch: Record<string, unknown> = { updated_at: trx.fn.now() };
  if (input.name !== undefined) patch.name = input.name;
  if (input.purpose !== undefined) patch.purpose = input.purpose;
  if (input.ownerId !== undefined) patch.owner_id = input.ownerId;
  const count = await trx("projects").where({ id }).update(patch);
  return count ? getProject(id, trx) : null;
}
