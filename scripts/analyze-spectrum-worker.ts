/**
 * Worker thread of the `analyze` command, for the second core. Two jobs, in order:
 *  1. "parse": the second half of a large file's data rows, read from the file here and parsed into
 *     the shared arrays the importer set aside for them, while the main thread parses the first half;
 *  2. "spectrum" (no kind): the windowed spectrum of the analysed channel, while the main thread
 *     fits the sine and the harmonics (the spectrum only serves the safety net, the spurs and the plot).
 * The samples live in shared memory; results go back on a message port, and a shared flag wakes the
 * main thread, which waits synchronously.
 */
import { closeSync, openSync, readSync } from "node:fs";
import { type MessagePort, parentPort, workerData } from "node:worker_threads";
import { type ParsedRows, parseRowStretch, prepareWindowedSpectrum, type RowLayout, windowedSpectrum } from "../lib/analysis";

interface Reply {
  port: MessagePort;
  done: SharedArrayBuffer;
}

interface ParseJob extends Reply {
  kind: "parse";
  path: string;
  startByte: number;
  layout: RowLayout;
  channels?: Float64Array[];
  capacity: number;
  /** The whole record's expected length, to build its FFT plan while the main thread finishes its half. */
  expectedSamples: number;
  maxFftLength?: number;
}

interface SpectrumJob extends Reply {
  kind?: undefined;
  samples: SharedArrayBuffer;
  byteOffset?: number;
  length: number;
  sampleRateHz: number;
  maxFftLength?: number;
}

const CHUNK_BYTES = 1 << 20;

function* fileChunks(path: string, startByte: number): Generator<Uint8Array> {
  const fd = openSync(path, "r");
  try {
    const buffer = new Uint8Array(CHUNK_BYTES);
    let position = startByte;
    for (;;) {
      const read = readSync(fd, buffer, 0, CHUNK_BYTES, position);
      if (read === 0) break;
      position += read;
      yield buffer.subarray(0, read);
    }
  } finally {
    closeSync(fd);
  }
}

/**
 * `inPlace`: the rows sit in the arrays the job brought (the main thread then uses its own views of
 * them; a SharedArrayBuffer posted back arrives as another object, so it could not tell).
 */
function parse(job: ParseJob): { rows?: ParsedRows; inPlace: boolean } {
  const rows = parseRowStretch(job.layout, fileChunks(job.path, job.startByte), { channels: job.channels, capacity: job.capacity });
  const given = job.channels;
  const inPlace = rows !== undefined && given !== undefined && rows.channels.every((c, k) => c.buffer === given[k].buffer && c.byteOffset === given[k].byteOffset);
  return { rows, inPlace };
}

function spectrum(job: SpectrumJob) {
  const samples = new Float64Array(job.samples, job.byteOffset ?? 0, job.length);
  return { spectrum: windowedSpectrum(samples, job.sampleRateHz, { maxFftLength: job.maxFftLength }) };
}

function run(job: ParseJob | SpectrumJob): void {
  const flag = new Int32Array(job.done);
  Atomics.store(flag, 0, 1);
  Atomics.notify(flag, 0);
  try {
    if (job.kind === "parse") {
      const reply = parse(job);
      const times = reply.rows?.times.buffer as ArrayBuffer | undefined;
      job.port.postMessage(reply, times && !(times instanceof SharedArrayBuffer) ? [times] : []);
      // Marked done first: the main thread may be waiting, and readying the spectrum is only for later.
      Atomics.store(flag, 0, 2);
      Atomics.notify(flag, 0);
      // This thread's half is usually done before the main thread's: build the whole record's FFT
      // plan in that gap (10M samples: 1.50 → 1.45 s), even if the head's spectrum then waits a little.
      prepareWindowedSpectrum(job.expectedSamples, { maxFftLength: job.maxFftLength });
    } else {
      const reply = spectrum(job);
      job.port.postMessage(reply, [reply.spectrum.amplitudeVpk.buffer as ArrayBuffer]);
      Atomics.store(flag, 0, 2);
      Atomics.notify(flag, 0);
    }
  } catch (error) {
    job.port.postMessage({ error: error instanceof Error ? error.message : String(error) });
  } finally {
    Atomics.store(flag, 0, 2);
    Atomics.notify(flag, 0);
  }
}

parentPort?.on("message", run);
// Before saying so: compile the spectrum code and build the head's plan, as the head's spectrum is
// asked for the moment the import ends, and the main thread waits for it (70-110 ms when computed
// cold under load); meanwhile the main thread goes on parsing, and splits later.
prepareWindowedSpectrum(1 << 16);
// Loaded and listening: the main thread splits the rows left at this moment.
if (workerData?.ready) Atomics.store(new Int32Array(workerData.ready as SharedArrayBuffer), 0, 1);
