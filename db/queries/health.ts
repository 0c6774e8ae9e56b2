import { db } from "../index";

/** Round-trips one query with a short statement timeout, for /api/health. */
export async function checkDatabase(): Promise<{ ok: true } | { ok: false; error: string }> {
  try {
    await db().raw("select 1").timeout(2000, { cancel: true });
    return { ok: true };
  } catch (err) {
    const detail = err instanceof Error ? err.message : String(err);
    return { ok: false, error: `PostgreSQL is not answering: ${detail}` };
  }
}
