import type { Knex } from "knex";
import type { Role } from "@/lib/auth/permissions";
import { db } from "../index";

export interface Invitation {
  id: string;
  email: string;
  role: Role;
  invitedBy: string | null;
  invitedByName: string | null;
  expiresAt: Date;
  lastSentAt: Date;
  createdAt: Date;
}

function toInvitation(r: Record<string, any>): Invitation {
  return {
    id: r.id,
    email: r.email,
    role: r.role,
    invitedBy: r.invited_by,
    invitedByName: r.invited_by_name ?? null,
    expiresAt: r.expires_at,
    lastSentAt: r.last_sent_at,
    createdAt: r.created_at,
  };
}

export async function createInvitationRow(
  input: { id: string; email: string; role: Role; tokenHash: string; invitedBy: string; expiresAt: Date },
  trx: Knex | Knex.Transaction = db(),
): Promise<Invitation> {
  const [row] = await trx("invitations")
    .insert({ id: input.id, email: input.email, role: input.role, token_hash: input.tokenHash, invited_by: input.invitedBy, expires_at: input.expiresAt })
    .returning("*");
  return toInvitation(row);
}

/** Invitations not yet accepted or revoked (expired ones included, so they can be resent), newest first. */
export async function listOpenInvitations(): Promise<Invitation[]> {
  const rows = await db()("invitations as i")
    .leftJoin("auth_user as u", "u.id", "i.invited_by")
    .select("i.*", "u.name as invited_by_name")
    .whereNull("i.accepted_at")
    .whereNull("i.revoked_at")
    .orderBy("i.created_at", "desc");
  return rows.map(toInvitation);
}

export async function getOpenInvitationById(id: string, trx: Knex | Knex.Transaction = db()): Promise<Invitation | null> {
  const row = await trx("invitations").where({ id }).whereNull("accepted_at").whereNull("revoked_at").first();
  return row ? toInvitation(row) : null;
}

export async function getOpenInvitationByEmail(email: string, trx: Knex | Knex.Transaction = db()): Promise<Invitation | null> {
  const row = await trx("invitations").where({ email }).whereNull("accepted_at").whereNull("revoked_at").first();
  return row ? toInvitation(row) : null;
}

/** The open, unexpired invitation with this token hash, or null; `lock` takes a row lock for accepting it. */
export async function getUsableInvitationByTokenHash(tokenHash: string, trx: Knex | Knex.Transaction = db(), lock = false): Promise<Invitation | null> {
  const q = trx("invitations")
    .where({ token_hash: tokenHash })
    .whereNull("accepted_at")
    .whereNull("revoked_at")
    .andWhere("expires_at", ">", trx.fn.now())
    .first();
  if (lock) q.forUpdate();
  const row = await q;
  return row ? toInvitation(row) : null;
}

/** Gives an open invitation a new token and expiry (resending makes the old link useless). */
export async function renewInvitation(id: string, tokenHash: string, expiresAt: Date): Promise<void> {
  await db()("invitations").where({ id }).update({ token_hash: tokenHash, expires_at: expiresAt, last_sent_at: db().fn.now() });
}

export async function markInvitationRevoked(id: string): Promise<boolean> {
  const n = await db()("invitations").where({ id }).whereNull("accepted_at").whereNull("revoked_at").update({ revoked_at: db().fn.now() });
  return n > 0;
}

export async function markInvitationAccepted(id: string, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("invitations").where({ id }).update({ accepted_at: trx.fn.now() });
}
