import pg from "pg";

// Idle workers wake when a job is queued instead of at their next poll: the transaction that queues a run's job
// also sends a NOTIFY on this channel (PostgreSQL delivers it at commit, so the job is visible by then; a rolled-back
// upload sends nothing), and each worker process LISTENs on one connection of its own. Polling stays as the
// fallback: a notification lost while that connection was down costs at most one polling interval, as before.

/** The channel a committed analysis job is announced on. */
export const ANALYSIS_QUEUED_CHANNEL = "tankbook_analysis_queued";

export interface QueueListener {
  stop(): Promise<void>;
}

const RECONNECT_FIRST_MS = 500;
const RECONNECT_MAX_MS = 10_000;

/**
 * Calls `onQueued` whenever a job is announced on {@link ANALYSIS_QUEUED_CHANNEL}. A lost connection is reopened
 * with doubling waits (up to 10 s); until then the workers simply poll.
 * @param connectionString - the queue's database
 * @param log - told when the connection is lost and when it is back
 */
export async function listenForQueuedJobs(connectionString: string, onQueued: () => void, log: (line: string) => void = () => undefined): Promise<QueueListener> {
  let client: pg.Client | null = null;
  let stopped = false;
  let retryMs = RECONNECT_FIRST_MS;
  let timer: NodeJS.Timeout | undefined;

  const connect = async (): Promise<void> => {
    const c = new pg.Client({ connectionString, application_name: "tankbook-worker-listen" });
    c.on("notification", (message) => {
      if (message.channel === ANALYSIS_QUEUED_CHANNEL) onQueued();
    });
    c.on("error", (err) => {
      log(`queue listener: ${err.message}; polling until it is back`);
      reconnectLater(c);
    });
    c.on("end", () => reconnectLater(c));
    try {
      await c.connect();
      await c.query(`LISTEN ${ANALYSIS_QUEUED_CHANNEL}`);
    } catch (err) {
      log(`queue listener could not connect (${err instanceof Error ? err.message : String(err)}); polling until it can`);
      reconnectLater(c);
      return;
    }
    if (stopped) return void c.end().catch(() => undefined);
    client = c;
    retryMs = RECONNECT_FIRST_MS;
    // Jobs queued while the listener was away were announced to nobody: look once now.
    onQueued();
  };

  const reconnectLater = (c: pg.Client): void => {
    if (client === c) client = null;
    c.removeAllListeners("end");
    c.end().catch(() => undefined);
    if (stopped || timer) return;
    timer = setTimeout(() => {
      timer = undefined;
      void connect();
    }, retryMs);
    timer.unref();
    retryMs = Math.min(retryMs * 2, RECONNECT_MAX_MS);
  };

  await connect();
  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      const c = client;
      client = null;
      if (c) {
        c.removeAllListeners("end");
        await c.end().catch(() => undefined);
      }
    },
  };
}
