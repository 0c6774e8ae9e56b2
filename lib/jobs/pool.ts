import { fileURLToPath } from "node:url";
import { Piscina } from "piscina";
import type { AnalysisTaskInput, AnalysisTaskOutput } from "./analysis-task";

/** A pool of worker threads that analyse captures, so a 10-million-sample capture never blocks the event loop. */
export interface AnalysisPool {
  run(input: AnalysisTaskInput): Promise<AnalysisTaskOutput>;
  destroy(): Promise<void>;
}

/**
 * Starts `threads` analysis threads. The task file is TypeScript: under tsx the threads inherit its loader
 * through execArgv; elsewhere (vitest) the loader is added explicitly (STACK-NOTES §12).
 */
export function createAnalysisPool(threads: number): AnalysisPool {
  const filename = fileURLToPath(new URL("./analysis-task.ts", import.meta.url));
  const hasTsxLoader = process.execArgv.some((arg) => arg.includes("tsx"));
  const pool = new Piscina({
    filename,
    minThreads: threads,
    maxThreads: threads,
    // Each thread runs one capture at a time; the queue in PostgreSQL holds the rest.
    concurrentTasksPerWorker: 1,
    idleTimeout: 60_000,
    ...(hasTsxLoader ? {} : { execArgv: [...process.execArgv, "--import", "tsx"] }),
  });
  return {
    run: (input) => pool.run(input) as Promise<AnalysisTaskOutput>,
    destroy: () => pool.destroy(),
  };
}
