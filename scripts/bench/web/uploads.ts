// Concurrent large uploads through the real API: one 1 000 000-sample capture, sent `count` times at once as
// multipart to POST /api/v1/builds/{id}/runs with a technician's token, each copy made distinct by one preamble
// line (so its SHA-256 differs and none is answered as a duplicate), then polled until every run is analysed.
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

export interface UploadOptions {
  origin: string;
  buildId: string;
  token: string;
  count: number;
  samples: number;
  deadlineS: number;
}

/** The capture a bench scope writes at 100 MS/s: 1 M samples of a 1.59 MHz tank, 8-bit, a little noise. */
function baseCapture(samples: number): Buffer {
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
  });
  const text = await response.text();
  if (response.status !== 201) throw new Error(`upload ${index}: HTTP ${response.status} ${text.slice(0, 300)}`);
  return (JSON.parse(text) as { id: string }).id;
}

async function runStatus(options: UploadOptions, runId: string): Promise<{ status: string; error: string | null }> {
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
