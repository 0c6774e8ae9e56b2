import type { Knex } from "knex";
import type { Role } from "@/lib/auth/permissions";
import { db } from "../index";

export type UserStatus = "active" | "disabled";

/** A person as the app sees them; the password hash never leaves this file except through getPasswordHashByEmail. */
export interface User {
  id: string;
  email: string;
  name: string;
  role: Role;
  status: UserStatus;
  createdAt: Date;
  lastSeenAt: Date | null;
}

interface UserRow {
  id: string;
  email: string;
  name: string;
  password_hash: string | null;
  role: Role;
  status: UserStatus;
  created_at: Date;
  updated_at: Date;
  last_seen_at: Date | null;
}

const publicColumns = ["id", "email", "name", "role", "status", "created_at", "last_seen_at"];

function toUser(row: Omit<UserRow, "password_hash" | "updated_at">): User {
  return {
    id: row.id,
    email: row.email,
    name: row.name,
    role: row.role,
    status: row.status,
    createdAt: row.created_at,
    lastSeenAt: row.last_seen_at,
  };
}

export async function getUserById(id: string, trx: Knex | Knex.Transaction = db()): Promise<User | null> {
  const row = await trx("auth_user").select<UserRow | undefined>(publicColumns).where({ id }).first();
  return row ? toUser(row) : null;
}

export async function getUserByEmail(email: string, trx: Knex | Knex.Transaction = db()): Promise<User | null> {
  const row = await trx("auth_user").select<UserRow | undefined>(publicColumns).where({ email }).first();
  return row ? toUser(row) : null;
}

/** The user and their password hash, for sign-in only. */
export async function getCredentialsByEmail(email: string): Promise<{ user: User; passwordHash: string | null } | null> {
  const row = await db()<UserRow>("auth_user").where({ email }).first();
  return row ? { user: toUser(row), passwordHash: row.password_hash } : null;
}

export async function getPasswordHashById(id: string): Promise<string | null> {
  const row = await db()<UserRow>("auth_user").select("password_hash").where({ id }).first();
  return row?.password_hash ?? null;
}

/** Everyone, admins first, then by name. */
export async function listUsers(): Promise<User[]> {
  const rows = await db()("auth_user")
    .select<UserRow[]>(publicColumns)
    .orderByRaw("case role when 'admin' then 0 when 'engineer' then 1 when 'technician' then 2 else 3 end")
    .orderBy("name");
  return rows.map(toUser);
}

export async function createUser(
  input: { id: string; email: string; name: string; role: Role; passwordHash: string | null },
  trx: Knex | Knex.Transaction = db(),
): Promise<User> {
  const [row]: UserRow[] = await trx("auth_user")
    .insert({ id: input.id, email: input.email, name: input.name, role: input.role, password_hash: input.passwordHash })
    .returning(publicColumns);
  return toUser(row);
}

export async function updateUserName(id: string, name: string): Promise<void> {
  await db()("auth_user").where({ id }).update({ name, updated_at: db().fn.now() });
}

export async function updatePasswordHash(id: string, passwordHash: string, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("auth_user").where({ id }).update({ password_hash: passwordHash, updated_at: trx.fn.now() });
}

export async function updateUserRole(id: string, role: Role, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("auth_user").where({ id }).update({ role, updated_at: trx.fn.now() });
}

export async function updateUserStatus(id: string, status: UserStatus, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("auth_user").where({ id }).update({ status, updated_at: trx.fn.now() });
}

/**
 * Locks every active admin row (FOR UPDATE) and returns their ids, so two admins demoting each other
 * at once cannot leave the team with none.
 */
export async function lockActiveAdminIds(trx: Knex.Transaction): Promise<string[]> {
  const rows = await trx<UserRow>("auth_user").select("id").where({ role: "admin", status: "active" }).forUpdate();
  return rows.map((r) => r.id);
}

/** Marks the user seen now, at most once a minute so every request does not write. */
export async function touchLastSeen(id: string): Promise<void> {
  await db()("auth_user")
    .where({ id })
    .andWhere((q) => q.whereNull("last_seen_at").orWhere("last_seen_at", "<", db().raw("now() - interval '1 minute'")))
    .update({ last_seen_at: db().fn.now() });
}
