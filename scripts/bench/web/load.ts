// One route under load: autocannon on loopback for a fixed time at a fixed number of connections. Latencies are
// kept per response so p95 is exact (autocannon's own table stops at p90/p97.5). The targets compare a route with
// the floor measured right beside it (interleaved pairs), because on a shared machine the floor itself moves by
// ±15 % from minute to minute.
import os from "node:os";
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
  /** One-minute load average when the measurement ended. */
  load1: number;
}

export interface LoadOptions {
  connections: number;
  durationS: number;
  warmupS: number;
  /** Interleaved floor/route pairs per JSON route. */
  pairs: number;
}

/** One floor measurement and one route measurement taken back to back. */
export interface LoadPair {
  floor: LoadFigures;
  route: LoadFigures;
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

/** Load without measuring: Next compiles and caches lazily, pools fill. */
export async function warmUp(route: RouteLoad, options: LoadOptions): Promise<void> {
  if (options.warmupS > 0) await fire(route, options.connections, options.warmupS);
}

/**
 * Measures the route for `options.durationS` (no warm-up: see {@link warmUp}).
 * @returns requests/s over the measured window and exact latency percentiles in ms
 */
export async function measureRoute(route: RouteLoad, options: LoadOptions): Promise<LoadFigures> {
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
    load1: os.loadavg()[0],
  };
}

/**
 * `options.pairs` floor/route pairs, the order flipped every other pair so a trend in the machine's load
 * (another process starting or ending) falls on both sides alike.
 */
export async function measurePairs(floor: RouteLoad, route: RouteLoad, options: LoadOptions): Promise<LoadPair[]> {
  const pairs: LoadPair[] = [];
  for (let i = 0; i < options.pairs; i++) {
    if (i % 2 === 0) {
      const f = await measureRoute(floor, options);
      pairs.push({ floor: f, route: await measureRoute(route, options) });
    } else {
      const r = await measureRoute(route, options);
      pairs.push({ floor: await measureRoute(floor, options), route: r });
    }
  }
  return pairs;
}
