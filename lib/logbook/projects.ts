import { db } from "@/db/index";
import * as q from "@/db/queries/projects";
import { requirePermission } from "@/lib/auth/require-permission";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { NotFoundError } from "@/lib/errors";
import type { ProjectInput, ProjectPatch } from "@/lib/validations/project";
import { audit, isId, uniqueOr, type Actor } from "./context";

/**
 * Creates a project owned by the actor (engineer and above).
 * @param options.at - back-dated creation time (the demo seed's history); the database clock otherwise
 * @throws ForbiddenError/UnauthorizedError; ConflictError when the name is taken
 */
export async function createProject(actor: Actor, input: ProjectInput, options: { at?: Date } = {}): Promise<q.Project> {
  const user = requirePermission(actor.user, "project:write");
  return uniqueOr(`A project named “${input.name}” already exists.`, () =>
    db().transaction(async (trx) => {
      const project = await q.createProject({ name: input.name, purpose: input.purpose, ownerId: user.id, createdAt: options.at }, trx);
      await audit({ ...actor, user }, "project.created", { type: "project", id: project.id }, { name: project.name }, trx);
      return project;
    }),
  );
}

/** Renames a project or changes its purpose (engineer and above). */
export async function updateProject(actor: Actor, projectId: string, patch: ProjectPatch): Promise<q.Project> {
  const user = requirePermission(actor.user, "project:write");
  if (!isId(projectId)) throw new NotFoundError("The project");
  return uniqueOr(`A project named “${patch.name}” already exists.`, () =>
    db().transaction(async (trx) => {
      const project = await q.updateProject(projectId, patch, trx);
      if (!project) throw new NotFoundError("The project");
      await audit({ ...actor, user }, "project.updated", { type: "project", id: projectId }, { ...patch }, trx);
      return project;
    }),
  );
}

/** Projects, newest first, for anyone signed in. */
export async function listProjects(user: CurrentUser | null, filter: q.ProjectFilter = {}) {
  requirePermission(user, "read");
  return q.listProjects(filter);
}

/** @throws NotFoundError */
export async function getProject(user: CurrentUser | null, projectId: string): Promise<q.Project> {
  requirePermission(user, "read");
  const project = isId(projectId) ? await q.getProject(projectId) : null;
  if (!project) throw new NotFoundError("The project");
  return project;
}
