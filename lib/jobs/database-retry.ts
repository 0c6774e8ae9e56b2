import { unavailableService } from "@/lib/errors";

export interface DatabaseRetryOptions {
  /** Stop retrying once this long has passed since the first failure, in ms (default 30 000). */
  giveUpAfterMs?: number;
  /** Wait before the first retry, in ms; each later wait doubles, up to `maxDelayMs` (default 500). */
  firstDelayMs?: number;
  /** Longest wait between two tries, in ms (default 5 000). */
  maxDelayMs?: number;
  /** Told of each retry before its wait. */
  onRetry?: (err: unknown, delayMs: number) => void;
}

/**
 * Runs `work`, and runs it again with doubling waits while it fails because the database is out of reach
 * ({@link unavailableService} says "database"), so a write made during a short outage lands as soon as the
 * database is back instead of waiting out the queue's job timeout. `work` must be safe to repeat (a transaction
 * that either committed whole or not at all).
 *
 * @param work - the write to make
 * @param options - waits in ms; see {@link DatabaseRetryOptions}
 * @returns what `work` returns
 * @throws the first error that is not a lost database at once, else the last one after `giveUpAfterMs`
 */
export async function retryWhileDatabaseDown<T>(work: () => Promise<T>, options: DatabaseRetryOptions = {}): Promise<T> {
  const giveUpAfterMs = options.giveUpAfterMs ?? 30_000;
  const maxDelayMs = options.maxDelayMs ?? 5_000;
  let delayMs = options.firstDelayMs ?? 500;
  let firstFailureAt: number | undefined;
  for (;;) {
    try {
      return await work();
    } catch (err) {
      if (unavailableService(err) !== "database") throw err;
      firstFailureAt ??= Date.now();
      const leftMs = giveUpAfterMs - (Date.now() - firstFailureAt);
      if (leftMs <= 0) throw err;
      const waitMs = Math.min(delayMs, maxDelayMs, leftMs);
      options.onRetry?.(err, waitMs);
      await new Promise((resolve) => setTimeout(resolve, waitMs));
      delayMs *= 2;
    }
  }
}
