// `npm run worker`: a standalone analysis worker. Run as many as you like, on any machine that reaches the
// same PostgreSQL and object storage (DATABASE_URL, S3_*); `npm start` runs one beside the web server.
import { closeDb } from "../db/index";
import { unavailableService } from "../lib/errors";
import { startAnalysisWorker } from "../lib/jobs/worker";
import { stopSender } from "../lib/jobs/queue";

function log(line: string): void {
  process.stdout.write(`[worker ${process.pid}] ${line}\n`);
}

// pg-boss 10 reports a finished job with complete()/fail() calls it does not await (manager.js, work()): while
// PostgreSQL is down those promises reject with no one listening, and Node would end this process. The job is
// not lost (it stays active in the queue and is retried when it expires), so such a rejection is logged and the
// worker keeps polling until the database is back. Anything else unhandled still stops the worker.
process.on("unhandledRejection", (reason) => {
  const message = reason instanceof Error ? reason.message : String(reason);
  if (unavailableService(reason) === "database") {
    log(`database unavailable, the queue will retry: ${message}`);
    return;
  }
  log(`unhandled rejection: ${reason instanceof Error ? (reason.stack ?? message) : message}`);
  process.exit(1);
});

async function main(): Promise<void> {
  const worker = await startAnalysisWorker({ log });
  log("waiting for analysis jobs");
  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    log(`${signal}: finishing the running jobs, then stopping`);
    try {
      await worker.stop();
      await stopSender();
      await closeDb();
      process.exit(0);
    } catch (err) {
      log(`stop failed: ${err instanceof Error ? err.message : String(err)}`);
      process.exit(1);
    }
  };
  process.on("SIGTERM", () => void stop("SIGTERM"));
  process.on("SIGINT", () => void stop("SIGINT"));
}

main().catch((err) => {
  log(`could not start: ${err instanceof Error ? err.message : String(err)}`);
  process.exit(1);
});
