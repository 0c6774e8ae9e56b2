import { recordAudit } from "@/db/queries/audit";
import { getUserById, lockActiveAdminIds, updateUserRole, updateUserStatus, type UserStatus } from "@/db/queries/users";
import { db } from "@/db/index";
import { ConflictError, NotFoundError } from "@/lib/errors";
import type { CurrentUser } from "./current-user-type";
import type { Role } from "./permissions";
import type { RequestMeta } from "./sign-in";

const LAST_ADMIN_MESSAGE = "You are the last admin: make someone else an admin first, so the team is never left without one.";

/**
 * Changes a person's role. The caller must have checked people:manage.
 * @throws NotFoundError for an unknown user; ConflictError when it would leave no active admin
 */
export async function changeRole(input: { actor: CurrentUser; userId: string; role: Role }, meta: RequestMeta): Promise<void> {
  await db().transaction(async (trx) => {
    const admins = await lockActiveAdminIds(trx);
    const target = await getUserById(input.userId, trx);
    if (!target) throw new NotFoundError("That person");
    if (target.role === input.role) return;
    if (target.role === "admin" && target.status === "active" && admins.length === 1 && admins[0] === target.id) {
      throw new ConflictError(target.id === input.actor.id ? LAST_ADMIN_MESSAGE : `${target.name} is the last admin; make someone else an admin first.`);
    }
    await updateUserRole(target.id, input.role, trx);
    await recordAudit({ actorId: input.actor.id, action: "user.role-changed", entityType: "user", entityId: target.id, detail: { from: target.role, to: input.role }, ip: meta.ip }, trx);
  });
}

/**
 * Disables (ending all sessions and tokens' use) or re-enables an account. The caller must have checked people:manage.
 * @throws NotFoundError for an unknown user; ConflictError when it would leave no active admin
 */
export async function setUserStatus(input: { actor: CurrentUser; userId: string; status: UserStatus }, meta: RequestMeta): Promise<void> {
  await db().transaction(async (trx) => {
    const admins = await lockActiveAdminIds(trx);
    const target = await getUserById(input.userId, trx);
    if (!target) throw new NotFoundError("That person");
    if (target.status === input.status) return;
    if (input.status === "disabled" && target.role === "admin" && admins.length === 1 && admins[0] === target.id) {
      throw new ConflictError(target.id === input.actor.id ? LAST_ADMIN_MESSAGE : `${target.name} is the last admin; make someone else an admin first.`);
    }
    await updateUserStatus(target.id, input.status, trx);
    if (input.status === "disabled") await trx("user_session").where({ user_id: target.id }).delete();
    await recordAudit({ actorId: input.actor.id, action: input.status === "disabled" ? "user.disabled" : "user.enabled", entityType: "user", entityId: target.id, ip: meta.ip }, trx);
  });
}
