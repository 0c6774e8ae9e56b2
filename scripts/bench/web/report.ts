// The figures as printed: one table of the routes side by side, the targets met or not, the upload run.
import os from "node:os";
import type { LoadFigures, LoadOptions } from "./load";
import type { UploadFigures } from "./uploads";

/** Issue 9's targets for the JSON routes at 32 connections. */
export const TARGET_P95_MS = 50;
export const TARGET_FLOOR_RATIO = 0.5;

function pad(text: string, width: number, right = false): string {
  return right ? text.padStart(width) : text.padEnd(width);
}

export function machineLine(options: LoadOptions): string {
  const cpu = os.cpus()[0]?.model.trim() ?? "unknown CPU";
  // The load average tells whether other work shared the cores while the figures were taken.
  const load = os.loadavg().map((l) => l.toFixed(1)).join(" / ");
  return `machine: ${os.availableParallelism()} cores (${cpu}), Node ${process.version}, load average ${load}; ${options.connections} connections, ${options.warmupS} s warm-up + ${options.durationS} s per route, loopback`;
}

/** The side-by-side table; the first row is the floor the others are compared with. */
export function loadTable(rows: LoadFigures[]): string {
  const floor = rows[0];
  const head = `${pad("route", 34)}${pad("req/s", 9, true)}${pad("p50 ms", 9, true)}${pad("p95 ms", 9, true)}${pad("p99 ms", 9, true)}${pad("× floor", 9, true)}${pad("KiB/resp", 10, true)}${pad("non-2xx", 9, true)}`;
  const lines = rows.map(
    (r) =>
      `${pad(r.name, 34)}${pad(r.requestsPerS.toFixed(0), 9, true)}${pad(r.p50Ms.toFixed(1), 9, true)}${pad(r.p95Ms.toFixed(1), 9, true)}${pad(r.p99Ms.toFixed(1), 9, true)}${pad(`${(r.requestsPerS / floor.requestsPerS).toFixed(2)}`, 9, true)}${pad((r.meanBytes / 1024).toFixed(1), 10, true)}${pad(String(r.non2xx + r.errors), 9, true)}`,
  );
  return [head, "-".repeat(head.length), ...lines].join("\n");
}

/** One line per target and JSON route: met / not met with the figure. */
export function targetLines(rows: LoadFigures[]): { lines: string[]; allMet: boolean } {
  const floor = rows[0];
  const lines: string[] = [];
  let allMet = true;
  for (const r of rows.filter((row) => row.json)) {
    const clean = r.non2xx + r.errors === 0;
    const p95Met = clean && r.p95Ms < TARGET_P95_MS;
    const ratio = r.requestsPerS / floor.requestsPerS;
    const ratioMet = clean && ratio >= TARGET_FLOOR_RATIO;
    allMet &&= p95Met && ratioMet;
    const spoilt = clean ? "" : ` (${r.non2xx} non-2xx, ${r.errors} errors)`;
    lines.push(`${p95Met ? "met    " : "NOT MET"}  ${r.name}: p95 ${r.p95Ms.toFixed(1)} ms < ${TARGET_P95_MS} ms${spoilt}`);
    lines.push(`${ratioMet ? "met    " : "NOT MET"}  ${r.name}: ${(ratio * 100).toFixed(0)} % of the floor's throughput ≥ ${TARGET_FLOOR_RATIO * 100} %${spoilt}`);
  }
  return { lines, allMet };
}

export function uploadLines(u: UploadFigures): string[] {
  const lines = [
    `${u.count} concurrent uploads of a ${(u.samples / 1e6).toFixed(0)} M-sample capture (${(u.fileBytes / 1024 / 1024).toFixed(1)} MiB each) through POST /api/v1/builds/{id}/runs`,
    `  all uploads answered after ${u.uploadSeconds.toFixed(1)} s; last analysis finished ${u.lastResultSeconds.toFixed(1)} s after the first request`,
    `  ${u.done} done, ${u.failed} failed, ${u.lost} lost  →  ${u.done === u.count ? "met" : "NOT MET"}: all analysed, none lost`,
  ];
  for (const f of u.failures.slice(0, 10)) lines.push(`  ! ${f}`);
  return lines;
}
