// The figures as printed: the routes side by side, each JSON route against the floor measured beside it, the
// targets (issue 14) with figure and ratio, and the upload runs.
import { execFileSync } from "node:child_process";
import os from "node:os";
import { root } from "./config";
import type { LoadFigures, LoadOptions, LoadPair } from "./load";
import type { SingleUploadFigures, UploadFigures } from "./uploads";

/** Issue 14's targets for the JSON routes at 32 connections, as ratios to the floor measured beside them. */
export const TARGET_FLOOR_RATIO = 0.6;
export const TARGET_P95_RATIO = 1.5;
/** Issue 14: a finished 1M-sample upload is `done` within this, on an idle machine. */
export const TARGET_UPLOAD_TO_DONE_S = 1.5;

function pad(text: string, width: number, right = false): string {
  return right ? text.padStart(width) : text.padEnd(width);
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

function loadText(): string {
  return os.loadavg().map((l) => l.toFixed(1)).join(" / ");
}

/** The commit measured, with "+changes" when the working tree differs from it (other helpers' edits count too). */
export function commitLine(): string {
  try {
    const head = execFileSync("git", ["rev-parse", "--short", "HEAD"], { cwd: root, encoding: "utf8" }).trim();
    const dirty = execFileSync("git", ["status", "--porcelain", "--untracked-files=no"], { cwd: root, encoding: "utf8" }).trim() !== "";
    return `commit ${head}${dirty ? " +uncommitted changes" : ""}`;
  } catch {
    return "commit unknown (no git)";
  }
}

export function machineLine(options: LoadOptions): string {
  const cpu = os.cpus()[0]?.model.trim() ?? "unknown CPU";
  // The load average tells whether other work shared the cores while the figures were taken.
  return `machine: ${os.availableParallelism()} cores (${cpu}), Node ${process.version}, load average ${loadText()}, ${commitLine()}; ${options.connections} connections, ${options.pairs} interleaved pairs of ${options.durationS} s per JSON route after ${options.warmupS} s warm-up, loopback`;
}

/** The side-by-side table: one line per measurement, the ratio against the floor measured beside it. */
export function loadTable(rows: { figures: LoadFigures; floor: LoadFigures | null }[]): string {
  const head = `${pad("route", 34)}${pad("req/s", 8, true)}${pad("p50 ms", 8, true)}${pad("p95 ms", 8, true)}${pad("p99 ms", 8, true)}${pad("× floor", 9, true)}${pad("p95 × fl", 9, true)}${pad("KiB/resp", 9, true)}${pad("non-2xx", 8, true)}${pad("load", 6, true)}`;
  const lines = rows.map(({ figures: r, floor }) => {
    const ratio = floor ? (r.requestsPerS / floor.requestsPerS).toFixed(2) : "—";
    const p95 = floor ? (r.p95Ms / floor.p95Ms).toFixed(2) : "—";
    return `${pad(r.name, 34)}${pad(r.requestsPerS.toFixed(0), 8, true)}${pad(r.p50Ms.toFixed(1), 8, true)}${pad(r.p95Ms.toFixed(1), 8, true)}${pad(r.p99Ms.toFixed(1), 8, true)}${pad(ratio, 9, true)}${pad(p95, 9, true)}${pad((r.meanBytes / 1024).toFixed(1), 9, true)}${pad(String(r.non2xx + r.errors), 8, true)}${pad(r.load1.toFixed(1), 6, true)}`;
  });
  return [head, "-".repeat(head.length), ...lines].join("\n");
}

/** Medians over a route's pairs, as the targets judge them. */
export interface PairSummary {
  name: string;
  ratio: number;
  ratioRange: [number, number];
  p95Ratio: number;
  p95Range: [number, number];
  p95Ms: number;
  floorP95Ms: number;
  clean: boolean;
}

export function summarisePairs(name: string, pairs: LoadPair[]): PairSummary {
  const ratios = pairs.map((p) => p.route.requestsPerS / p.floor.requestsPerS);
  const p95s = pairs.map((p) => p.route.p95Ms / p.floor.p95Ms);
  return {
    name,
    ratio: median(ratios),
    ratioRange: [Math.min(...ratios), Math.max(...ratios)],
    p95Ratio: median(p95s),
    p95Range: [Math.min(...p95s), Math.max(...p95s)],
    p95Ms: median(pairs.map((p) => p.route.p95Ms)),
    floorP95Ms: median(pairs.map((p) => p.floor.p95Ms)),
    clean: pairs.every((p) => p.route.non2xx + p.route.errors + p.floor.non2xx + p.floor.errors === 0),
  };
}

function verdict(met: boolean): string {
  return met ? "met    " : "NOT MET";
}

/** Two lines per JSON route: throughput and p95 against the floor, target beside figure. */
export function targetLines(summaries: PairSummary[]): { lines: string[]; allMet: boolean } {
  const lines: string[] = [];
  let allMet = true;
  for (const s of summaries) {
    const spoilt = s.clean ? "" : " (non-2xx responses or errors in a pair)";
    const ratioMet = s.clean && s.ratio >= TARGET_FLOOR_RATIO;
    const p95Met = s.clean && s.p95Ratio <= TARGET_P95_RATIO;
    allMet &&= ratioMet && p95Met;
    lines.push(
      `${verdict(ratioMet)}  ${pad(s.name, 30)} throughput ${s.ratio.toFixed(2)}× the floor (pairs ${s.ratioRange[0].toFixed(2)}–${s.ratioRange[1].toFixed(2)})   target ≥ ${TARGET_FLOOR_RATIO}×${spoilt}`,
    );
    lines.push(
      `${verdict(p95Met)}  ${pad(s.name, 30)} p95 ${s.p95Ms.toFixed(1)} ms = ${s.p95Ratio.toFixed(2)}× the floor's ${s.floorP95Ms.toFixed(1)} ms (pairs ${s.p95Range[0].toFixed(2)}–${s.p95Range[1].toFixed(2)})   target ≤ ${TARGET_P95_RATIO}×${spoilt}`,
    );
  }
  return { lines, allMet };
}

export function singleUploadLines(u: SingleUploadFigures): { lines: string[]; met: boolean } {
  const s = (x: number) => `${x.toFixed(2)} s`;
  const lines = [`${u.uploads.length + u.failures.length} single uploads of a ${(u.samples / 1e6).toFixed(0)} M-sample capture (${(u.fileBytes / 1024 / 1024).toFixed(1)} MiB), one after another, nothing else loading the stack:`];
  lines.push(`  ${pad("upload", 8)}${pad("answer→done", 13, true)}${pad("queue", 8, true)}${pad("claim→result", 14, true)}${pad("result→seen", 13, true)}${pad("load", 6, true)}`);
  u.uploads.forEach((x, i) =>
    lines.push(`  ${pad(String(i + 1), 8)}${pad(s(x.answeredToDoneS), 13, true)}${pad(s(x.queueS), 8, true)}${pad(s(x.claimToResultS), 14, true)}${pad(s(x.resultToSeenS), 13, true)}${pad(x.load1.toFixed(1), 6, true)}`),
  );
  for (const f of u.failures) lines.push(`  ! ${f}`);
  // The first upload also wakes the worker's connections and thread; the median of the rest is the figure.
  const counted = u.uploads.length > 1 ? u.uploads.slice(1) : u.uploads;
  const figure = counted.length ? median(counted.map((x) => x.answeredToDoneS)) : Number.NaN;
  const overhead = figure - u.engineS;
  const met = u.failures.length === 0 && figure <= TARGET_UPLOAD_TO_DONE_S;
  lines.push(`  engine alone on the same bytes (import + analysis in this process, median of 3): ${s(u.engineS)}`);
  lines.push(
    `${verdict(met)}  upload answered → done ${s(figure)} (median${u.uploads.length > 1 ? " without the first" : ""}; pipeline beyond the engine ${s(overhead)}, load ${loadText()})   target ≤ ${TARGET_UPLOAD_TO_DONE_S} s`,
  );
  return { lines, met };
}

export function uploadLines(u: UploadFigures): string[] {
  const lines = [
    `${u.count} concurrent uploads of a ${(u.samples / 1e6).toFixed(0)} M-sample capture (${(u.fileBytes / 1024 / 1024).toFixed(1)} MiB each) through POST /api/v1/builds/{id}/runs`,
    `  all uploads answered after ${u.uploadSeconds.toFixed(1)} s; last analysis finished ${u.lastResultSeconds.toFixed(1)} s after the first request (load ${loadText()})`,
    `${verdict(u.done === u.count)}  ${u.done} done, ${u.failed} failed, ${u.lost} lost: all analysed, none lost; time to the last one ${u.lastResultSeconds.toFixed(1)} s`,
  ];
  for (const f of u.failures.slice(0, 10)) lines.push(`  ! ${f}`);
  return lines;
}
