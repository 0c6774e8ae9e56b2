import type { Knex } from "knex";
import { db } from "../index";
import { toNumber } from "./pagination";

export type UploadPurpose = "capture" | "photo";

/** A presigned upload the server handed out: where the bytes must go, for whom, and until when. */
export interface UploadSlot {
  id: string;
  purpose: UploadPurpose;
  objectKey: string;
  /** The id the run (or photo) will get; the object key is built from it. */
  reservedId: string;
  userId: string;
  buildId: string;
  contentType: string;
  sizeBytes: number;
  originalFilename: string;
  expiresAt: Date;
  completedAt: Date | null;
  createdAt: Date;
}

interface SlotRow {
  id: string;
  purpose: UploadPurpose;
  object_key: string;
  reserved_id: string;
  user_id: string;
  build_id: string;
  content_type: string;
  size_bytes: string;
  original_filename: string;
  expires_at: Date;
  completed_at: Date | null;
  created_at: Date;
}

function toSlot(row: SlotRow): UploadSlot {
  return {
    id: row.id,
    purpose: row.purpose,
    objectKey: row.object_key,
    reservedId: row.reserved_id,
    userId: row.user_id,
    buildId: row.build_id,
    contentType: row.content_type,
    sizeBytes: toNumber(row.size_bytes) ?? 0,
    originalFilename: row.original_filename,
    expiresAt: row.expires_at,
    completedAt: row.completed_at,
    createdAt: row.created_at,
  };
}

export async function createUploadSlot(
  input: Omit<UploadSlot, "id" | "completedAt" | "createdAt">,
  trx: Knex | Knex.Transaction = db(),
): Promise<UploadSlot> {
  const [row]: SlotRow[] = await trx("upload_slots")
    .insert({
      purpose: input.purpose,
      object_key: input.objectKey,
      reserved_id: input.reservedId,
      user_id: input.userId,
      build_id: input.buildId,
      content_type: input.contentType,
      size_bytes: input.sizeBytes,
      original_filename: input.originalFilename,
      expires_at: input.expiresAt,
    })
    .returning("*");
  return toSlot(row);
}

export async function getUploadSlot(id: string, trx: Knex | Knex.Transaction = db()): Promise<UploadSlot | null> {
  const row: SlotRow | undefined = await trx("upload_slots").where({ id }).first();
  return row ? toSlot(row) : null;
}

export async function markUploadSlotCompleted(id: string, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("upload_slots").where({ id }).update({ completed_at: trx.fn.now() });
}

/** Slots past their expiry that were never completed; their objects (if any were PUT) can be deleted. */
export async function listExpiredUploadSlots(now: Date, limit = 100, trx: Knex | Knex.Transaction = db()): Promise<UploadSlot[]> {
  const rows: SlotRow[] = await trx("upload_slots").whereNull("completed_at").where("expires_at", "<", now).orderBy("expires_at").limit(limit);
  return rows.map(toSlot);
}

export async function deleteUploadSlot(id: string, trx: Knex | Knex.Transaction = db()): Promise<void> {
  await trx("upload_slots").where({ id }).delete();
}

/** The run a previous request with this Idempotency-Key created, if any. */
export async function getIdempotentRunId(userId: string, key: string, trx: Knex | Knex.Transaction = db()): Promise<string | null> {
  const row = await trx("api_idempotency_keys").where({ user_id: userId, key }).first<{ run_id: string } | undefined>("run_id");
  return row?.run_id ?? null;
}

/**
 * Remembers which run an Idempotency-Key produced.
 * @returns false when another request already claimed the key (the caller should answer with that run)
 */
export async function saveIdempotencyKey(userId: string, key: string, runId: string, trx: Knex | Knex.Transaction = db()): Promise<boolean> {
  const rows = await trx("api_idempotency_keys").insert({ user_id: userId, key, run_id: runId }).onConflict(["user_id", "key"]).ignore().returning("run_id");
  return rows.length > 0;
}
