import type { Knex } from "knex";
import { recordAudit } from "@/db/queries/audit";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { ConflictError } from "@/lib/errors";

/** Who is acting and from where; every mutation takes one so it can check the role and write the audit row. */
export interface Actor {
  user: CurrentUser | null;
  /** Client address for the audit log, when known. */
  ip?: string | null;
}

/** Writes the audit row for a mutation inside its transaction. */
export async function audit(
  actor: Actor & { user: CurrentUser },
  action: string,
  entity: { type: string; id: string },
  detail: Record<string, unknown>,
  trx: Knex | Knex.Transaction,
): Promise<void> {
  await recordAudit({ actorId: actor.user.id, action, entityType: entity.type, entityId: entity.id, detail, ip: actor.ip ?? null }, trx);
}

/** Runs `work`, turning a PostgreSQL unique violation into a 409 with `message`. */
export async function uniqueOr<T>(message: string, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if ((err as { code?: string }).code === "23505") throw new ConflictError(message);
    throw err;
  }
}

const UUID_RULE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** Ids from URLs reach SQL only when they are UUIDs; anything else is simply not found. */
export function isId(value: string): boolean {
  return UUID_RULE.test(value);
}
