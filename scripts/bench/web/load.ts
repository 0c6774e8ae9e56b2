// One route under load: autocannon on loopback for a fixed time at a fixed number of connections, after a
// shorter warm-up. Latencies are kept per response so p95 is exact (autocannon's own table stops at p90/p97.5).
import autocannon, { type AutocannonResult } from "autocannon";

export interface RouteLoad {
  name: string;
  /** Loopback origin, e.g. http://127.0.0.1:3400. */
  origin: string;
  /** Paths the requests take in turn (e.g. one run of each build), so the figure is not one hot row. */
  paths: string[];
  headers?: Record<string, string>;
  /** Counted toward the targets (JSON API routes). */
  json: boolean;
}

export interface LoadFigures {
  name: string;
  json: boolean;
  requests: number;
  requestsPerS: number;
  p50Ms: number;
  p95Ms: number;
  p99Ms: number;
  /** Responses other than 2xx, and socket errors or timeouts: any of them spoils the figure. */
  non2xx: number;
  errors: number;
  meanBytes: number;
}

export interface LoadOptions {
  connections: number;
  durationS: number;
  warmupS: number;
}

function percentile(sorted: Float64Array, p: number): number {
  if (sorted.length === 0) return Number.NaN;
  const rank = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[rank];
}

function fire(route: RouteLoad, connections: number, durationS: number, onResponse?: (ms: number, bytes: number) => void): Promise<AutocannonResult> {
  let next = 0;
  // Every route goes through setupRequest, one path or many, so the generator does the same work for each.
  const setupRequest = (request: Record<string, unknown>) => {
    request.path = route.paths[next++ % route.paths.length];
    return request;
  };
  return new Promise((resolve, reject) => {
    const instance = autocannon(
      {
        url: `${route.origin}${route.paths[0]}`,
        connections,
        duration: durationS,
        headers: route.headers ?? {},
        timeout: 10,
        title: route.name,
        requests: [{ setupRequest }],
      },
      (err, result) => (err ? reject(err) : resolve(result)),
    );
    if (onResponse) instance.on("response", (_client, _status, bytes, ms) => onResponse(ms, bytes));
  });
}

/**
 * Warms the route up (Next compiles and caches lazily, pools fill), then measures it.
 * @returns requests/s over the measured window and exact latency percentiles in ms
 */
export async function measureRoute(route: RouteLoad, options: LoadOptions): Promise<LoadFigures> {
  if (options.warmupS > 0) await fire(route, options.connections, options.warmupS);
  const latencies: number[] = [];
  let bytes = 0;
  const result = await fire(route, options.connections, options.durationS, (ms, b) => {
    latencies.push(ms);
    bytes += b;
  });
  const sorted = Float64Array.from(latencies).sort();
  return {
    name: route.name,
    json: route.json,
    requests: latencies.length,
    requestsPerS: latencies.length / result.duration,
    p50Ms: percentile(sorted, 50),
    p95Ms: percentile(sorted, 95),
    p99Ms: percentile(sorted, 99),
    non2xx: result.non2xx,
    errors: result.errors + result.timeouts,
    meanBytes: latencies.length ? bytes / latencies.length : 0,
  };
}
