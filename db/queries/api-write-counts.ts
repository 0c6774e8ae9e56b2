import { db } from "../index";

/**
 * Counts one write by `userId` in the current one-minute window and returns the window's count and start.
 * Windows older than ten minutes are dropped on the way, a few at a time, so the table stays small.
 */
export async function countApiWrite(userId: string, now = new Date()): Promise<{ count: number; windowStart: Date }> {
  const windowStart = new Date(Math.floor(now.getTime() / 60_000) * 60_000);
  const rows = await db().raw<{ rows: { count: number }[] }>(
    `insert into api_write_counts (user_id, window_start, count) values (?, ?, 1)
     on conflict (user_id, window_start) do update set count = api_write_counts.count + 1
     returning count`,
    [userId, windowStart],
  );
  if (rows.rows[0].count === 1) {
    await db().raw(
      `delete from api_write_counts where ctid in
         (select ctid from api_write_counts where window_start < ? limit 100)`,
      [new Date(windowStart.getTime() - 10 * 60_000)],
    );
  }
  return { count: rows.rows[0].count, windowStart };
}
