// Concurrent large uploads through the real API: one 1 000 000-sample capture, sent `count` times at once as
// multipart to POST /api/v1/builds/{id}/runs with a technician's token, each copy made distinct by one preamble
// line (so its SHA-256 differs and none is answered as a duplicate), then polled until every run is analysed.
// Before that, on an otherwise idle stack, single uploads one after another: the time from the upload's answer to
// `done`, split by the run's own timestamps, beside the engine's time for the same bytes in this process.
import os from "node:os";
import { db } from "../../../db/index";
import { analyseCaptureChunks } from "../../../lib/jobs/analysis-task";
import { synthCaptureCsv } from "../../lib/synth-capture";

export interface UploadFigures {
  count: number;
  samples: number;
  fileBytes: number;
  /** From the first request sent to the last upload answered. */
  uploadSeconds: number;
  /** From the first request sent to the last run done or failed. */
  lastResultSeconds: number;
  done: number;
  failed: number;
  /** Uploads refused or runs that never finished within the deadline. */
  lost: number;
  failures: string[];
}

export interface SingleUploadFigures {
  samples: number;
  fileBytes: number;
  /** One entry per upload, in the order sent. */
  uploads: {
    /** From the 201 to the first poll that saw `done` (polled every {@link FINE_POLL_MS} ms). */
    answeredToDoneS: number;
    /** From the 201 to the worker's claim (started_at): the queue's part. */
    queueS: number;
    /** From the claim to the start of the result transaction (finished_at): storage read, import, engine. */
    claimToResultS: number;
    /** From the result transaction's start to the poll that saw it: the write, the commit, half a poll. */
    resultToSeenS: number;
    load1: number;
  }[];
  /** The same bytes imported and analysed in this process, no storage or queue: the engine's own time (medians of 3). */
  engineS: number;
  failures: string[];
}

/** Poll period while timing one upload; at 50 requests/s the polling itself costs the server little. */
export const FINE_POLL_MS = 20;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid] : (sorted[mid - 1] + sorted[mid]) / 2;
}

/** The engine alone on `body` (import and analysis, as the worker thread runs them), median seconds of `repeat`. */
export async function engineSeconds(body: Buffer, repeat = 3): Promise<number> {
  const times: number[] = [];
  for (let i = 0; i < repeat; i++) {
    const started = performance.now();
    const output = await analyseCaptureChunks([new Uint8Array(body.buffer, body.byteOffset, body.byteLength)], { sizeBytes: body.length, channel: null, probeAttenuation: 10 });
    times.push((performance.now() - started) / 1000);
    if (!output.ok) throw new Error(`the engine refused the bench capture: ${output.message}`);
  }
  return median(times);
}

/**
 * `count` uploads one after another (each waits for the previous analysis), timing answer → done.
 * @param options.count - how many; the first one also warms the worker's thread and connections
 */
export async function singleUploads(options: UploadOptions): Promise<SingleUploadFigures> {
  const base = baseCapture(options.samples);
  const failures: string[] = [];
  const uploads: SingleUploadFigures["uploads"] = [];
  const engineS = await engineSeconds(base);
  for (let i = 1; i <= options.count; i++) {
    const body = Buffer.concat([Buffer.from(`Bench Single,${i}\n`), base]);
    const runId = await upload(options, body, 100 + i);
    const answeredAt = Date.now();
    const deadline = answeredAt + options.deadlineS * 1000;
    let status = "queued";
    while (Date.now() < deadline) {
      const run = await runStatus(options, runId);
      status = run.status;
      if (status === "done" || status === "failed") break;
      await new Promise((r) => setTimeout(r, FINE_POLL_MS));
    }
    const seenAt = Date.now();
    if (status !== "done") {
      failures.push(`single upload ${i} (run ${runId}) ended ${status}`);
      continue;
    }
    const row = await db()("runs").where({ id: runId }).first<{ started_at: Date; finished_at: Date }>("started_at", "finished_at");
    uploads.push({
      answeredToDoneS: (seenAt - answeredAt) / 1000,
      queueS: (row.started_at.getTime() - answeredAt) / 1000,
      claimToResultS: (row.finished_at.getTime() - row.started_at.getTime()) / 1000,
      resultToSeenS: (seenAt - row.finished_at.getTime()) / 1000,
      load1: os.loadavg()[0],
    });
  }
  return { samples: options.samples, fileBytes: base.length + 20, uploads, engineS, failures };
}

export interface UploadOptions {
  origin: string;
  buildId: string;
  token: string;
  count: number;
  samples: number;
  deadlineS: number;
}

/** The capture a bench scope writes at 100 MS/s: 1 M samples of a 1.59 MHz tank, 8-bit, a little noise. */
export function baseCapture(samples: number): Buffer {
  return Buffer.from(
    synthCaptureCsv({
      frequencyHz: 1.59e6,
      sampleRateHz: 100e6,
      samples,
      amplitudeV: 1.2,
      harmonicsDbc: [-38, -47],
      noiseVrms: 0.003,
      quantizationBits: 8,
      fullScaleV: 2,
      seed: 1_000_000,
      preamble: { Instrument: "bench scope 2", "Record Length": String(samples) },
    }),
    "utf8",
  );
}

async function upload(options: UploadOptions, body: Buffer, index: number): Promise<string> {
  const form = new FormData();
  form.set("file", new Blob([new Uint8Array(body)], { type: "text/csv" }), `load-${String(index).padStart(2, "0")}.csv`);
  form.set("probe", "10x");
  form.set("note", `bench:web concurrent upload ${index}`);
  const response = await fetch(`${options.origin}/api/v1/builds/${options.buildId}/runs`, {
    method: "POST",
    headers: { authorization: `Bearer ${options.token}` },
    body: form,
  }).catch((err: unknown) => {
    // undici says only "fetch failed"; the reason (a reset, a timeout) is in the cause.
    const cause = err instanceof Error && err.cause instanceof Error ? `: ${err.cause.message}` : "";
    throw new Error(`upload ${index}: ${err instanceof Error ? err.message : String(err)}${cause}`);
  });
  const text = await response.text();
  if (response.status !== 201) throw new Error(`upload ${index}: HTTP ${response.status} ${text.slice(0, 300)}`);
  return (JSON.parse(text) as { id: string }).id;
}

export async function runStatus(options: UploadOptions, runId: string): Promise<{ status: string; error: string | null }> {
  const response = await fetch(`${options.origin}/api/v1/runs/${runId}`, { headers: { authorization: `Bearer ${options.token}` } });
  if (response.status !== 200) return { status: `http-${response.status}`, error: null };
  return (await response.json()) as { status: string; error: string | null };
}

/**
 * Sends the uploads all at once and waits for every analysis.
 * @returns counts and the wall times from the first request to the last upload answer and the last result
 */
export async function concurrentUploads(options: UploadOptions): Promise<UploadFigures> {
  const base = baseCapture(options.samples);
  const bodies = Array.from({ length: options.count }, (_, i) => Buffer.concat([Buffer.from(`Bench Copy,${i + 1}\n`), base]));
  const failures: string[] = [];
  const started = performance.now();
  const outcomes = await Promise.allSettled(bodies.map((body, i) => upload(options, body, i + 1)));
  const uploadSeconds = (performance.now() - started) / 1000;
  const runIds: string[] = [];
  for (const outcome of outcomes) {
    if (outcome.status === "fulfilled") runIds.push(outcome.value);
    else failures.push(outcome.reason instanceof Error ? outcome.reason.message : String(outcome.reason));
  }

  const pending = new Set(runIds);
  let done = 0;
  let failed = 0;
  let lastResultSeconds = uploadSeconds;
  const deadline = started + options.deadlineS * 1000;
  while (pending.size > 0 && performance.now() < deadline) {
    await new Promise((r) => setTimeout(r, 250));
    for (const runId of [...pending]) {
      const run = await runStatus(options, runId);
      if (run.status !== "done" && run.status !== "failed") continue;
      pending.delete(runId);
      lastResultSeconds = (performance.now() - started) / 1000;
      if (run.status === "done") done++;
      else {
        failed++;
        failures.push(`run ${runId} failed: ${run.error}`);
      }
    }
  }
  for (const runId of pending) failures.push(`run ${runId} not finished after ${options.deadlineS} s`);
  return {
    count: options.count,
    samples: options.samples,
    fileBytes: bodies[0].length,
    uploadSeconds,
    lastResultSeconds,
    done,
    failed,
    lost: options.count - runIds.length + pending.size,
    failures,
  };
}
