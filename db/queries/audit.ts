import type { Knex } from "knex";
import { db } from "../index";

/** One row of the audit log: who did what to which entity, when, and from where. */
export interface AuditEvent {
  id: string;
  actorId: string | null;
  actorName: string | null;
  actorEmail: string | null;
  action: string;
  entityType: string | null;
  entityId: string | null;
  detail: Record<string, unknown>;
  ip: string | null;
  createdAt: Date;
}

export interface AuditInput {
  /** The user who acted; null for anonymous events (a failed sign-in to an unknown address). */
  actorId: string | null;
  /** Dotted verb, e.g. "sign-in.failed", "user.role-changed", "token.created". */
  action: string;
  entityType?: string;
  entityId?: string;
  /** Small JSON facts (old and new role, token name); never secrets or password hashes. */
  detail?: Record<string, unknown>;
  ip?: string | null;
}

/**
 * Writes one audit_events row. Every mutation calls this, inside its transaction when it has one.
 * @param trx the caller's transaction, so the event and the change commit together
 */
export async function recordAudit(event: AuditInput, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("audit_events").insert({
    actor_id: event.actorId,
    action: event.action,
    entity_type: event.entityType ?? null,
    entity_id: event.entityId ?? null,
    detail: JSON.stringify(event.detail ?? {}),
    ip: event.ip ?? null,
  });
}

export interface AuditFilter {
  actorId?: string;
  /** Matches the action itself or its group: "sign-in" matches "sign-in.failed". */
  action?: string;
  entityType?: string;
  from?: Date;
  to?: Date;
  limit?: number;
  offset?: number;
}

/** Audit events, newest first, with the actor's current name and e-mail. */
export async function listAuditEvents(filter: AuditFilter = {}): Promise<{ events: AuditEvent[]; total: number }> {
  const base = db()("audit_events as e").leftJoin("auth_user as u", "u.id", "e.actor_id");
  if (filter.actorId) base.where("e.actor_id", filter.actorId);
  if (filter.action) base.where((q) => q.where("e.action", filter.action!).orWhere("e.action", "like", `${filter.action!.replace(/[\\%_]/g, "\\$&")}.%`));
  if (filter.entityType) base.where("e.entity_type", filter.entityType);
  if (filter.from) base.where("e.created_at", ">=", filter.from);
  if (filter.to) base.where("e.created_at", "<", filter.to);
  const [rows, [{ count }]] = await Promise.all([
    base
      .clone()
      .select("e.*", "u.name as actor_name", "u.email as actor_email")
      .orderBy("e.created_at", "desc")
      .orderBy("e.id", "desc")
      .limit(filter.limit ?? 50)
      .offset(filter.offset ?? 0),
    base.clone().count<{ count: string }[]>({ count: "*" }),
  ]);
  return {
    total: Number(count),
    events: rows.map((r) => ({
      id: String(r.id),
      actorId: r.actor_id,
      actorName: r.actor_name,
      actorEmail: r.actor_email,
      action: r.action,
      entityType: r.entity_type,
      entityId: r.entity_id,
      detail: r.detail,
      ip: r.ip,
      createdAt: r.created_at,
    })),
  };
}

/** The distinct actions seen so far, for the audit page's filter menu. */
export async function listAuditActions(): Promise<string[]> {
  const rows = await db()("audit_events").distinct("action").orderBy("action");
  return rows.map((r) => r.action as string);
}
