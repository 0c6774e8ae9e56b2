// The part of autocannon 8's programmatic API the web bench uses (the package ships no types).
declare module "autocannon" {
  import type { EventEmitter } from "node:events";

  interface Histogram {
    average: number;
    mean: number;
    stddev: number;
    min: number;
    max: number;
    total: number;
    p50: number;
    p90: number;
    p97_5: number;
    p99: number;
  }

  export interface AutocannonResult {
    title?: string;
    url: string;
    requests: Histogram & { sent: number };
    latency: Histogram;
    throughput: Histogram;
    duration: number;
    errors: number;
    timeouts: number;
    non2xx: number;
    statusCodeStats: Record<string, { count: number }>;
  }

  export interface AutocannonOptions {
    url: string;
    connections?: number;
    duration?: number;
    amount?: number;
    timeout?: number;
    pipelining?: number;
    method?: string;
    headers?: Record<string, string>;
    title?: string;
    requests?: { setupRequest?: (request: Record<string, unknown>, context: Record<string, unknown>) => Record<string, unknown> | null }[];
  }

  export interface Instance extends EventEmitter {
    stop(): void;
    on(event: "response", listener: (client: unknown, statusCode: number, resBytes: number, responseTimeMs: number) => void): this;
    on(event: "done", listener: (result: AutocannonResult) => void): this;
    on(event: string, listener: (...args: unknown[]) => void): this;
  }

  function autocannon(options: AutocannonOptions, callback: (err: Error | null, result: AutocannonResult) => void): Instance;
  export default autocannon;
}
