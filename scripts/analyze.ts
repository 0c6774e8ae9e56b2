/**
 * The `analyze` command: runs the capture analysis engine on one CSV file.
 *
 *   npm run -s analyze -- FILE [--channel NAME] [--harmonics N] [--probe N] [--json]
 *
 * --probe N multiplies the file's volts by a probe's attenuation, for a scope that was not told about the probe.
 *
 * --json prints one JSON object (the analysis result, SI units, no plot data) on stdout; without it
 * a short table. Bad input: exit status 1, one line on stderr, nothing on stdout. Bad usage: 2.
 */
import { closeSync, fstatSync, openSync, readSync } from "node:fs";
import { MessageChannel, type MessagePort, receiveMessageOnPort, Worker } from "node:worker_threads";
import {
  analysisChannels,
  analyzeCapture,
  applyProbeAttenuation,
  type AnalysisResult,
  type AnalyzeOptions,
  CaptureImporter,
  CaptureImportError,
  type Capture,
  formatSampleRate,
  type ParsedRows,
  type Spectrum,
  windowedSpectrum,
} from "../lib/analysis";
import { stabilityLines } from "../lib/analysis/stability/summary";

const USAGE = "usage: analyze FILE [--channel NAME] [--harmonics N] [--probe N] [--json]";
const CHUNK_BYTES = 1 << 20;

const HELP = `${USAGE}

Runs the capture analysis on one CSV file and prints a short table.
  --channel NAME   the channel to analyse (default: the first voltage column)
  --harmonics N    how many harmonics to measure, 1 to 100
  --probe N        multiply the volts by a probe's attenuation (10, 10x, 10:1) the scope was not told about
  --json           print one JSON object (SI units, no plot data) instead of the table
  --help, -h       print this help
Exit status: 0 done, 1 bad input (one line on stderr), 2 bad usage.
`;

class UsageError extends Error {}
/** Thrown by the option parser for --help: not an error, the help goes to stdout with status 0. */
class HelpRequested extends Error {}

interface Arguments {
  file: string;
  channel?: string;
  harmonics?: number;
  probe: number;
  json: boolean;
}

function parseArguments(argv: string[]): Arguments {
  let file: string | undefined;
  let channel: string | undefined;
  let harmonics: number | undefined;
  let probe = 1;
  let json = false;
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i];
    if (arg === "--help" || arg === "-h") throw new HelpRequested();
    else if (arg === "--json") json = true;
    else if (arg === "--channel" || arg === "--harmonics" || arg === "--probe") {
      const value = argv[++i];
      if (value === undefined) throw new UsageError(`${arg} needs a value; ${USAGE}`);
      if (arg === "--channel") channel = value;
      else if (arg === "--probe") {
        probe = Number(value.replace(/^x|x$|:1$/gi, ""));
        if (!Number.isFinite(probe) || probe < 1) throw new UsageError(`--probe must be a number of at least 1 (10, 10x, 10:1), got '${value}'`);
      } else {
        harmonics = Number(value);
        if (!Number.isInteger(harmonics) || harmonics < 1 || harmonics > 100) {
          throw new UsageError(`--harmonics must be an integer from 1 to 100, got '${value}'`);
        }
      }
    } else if (arg.startsWith("--channel=")) channel = arg.slice("--channel=".length);
    else if (arg.startsWith("-")) throw new UsageError(`unknown option '${arg}'; ${USAGE}`);
    else if (file === undefined) file = arg;
    else throw new UsageError(`one file only, got '${file}' and '${arg}'; ${USAGE}`);
  }
  if (file === undefined) throw new UsageError(USAGE);
  return { file, channel, harmonics, probe, json };
}

// Files this large have their second half parsed on the worker thread while this one parses the
// first; below it the worker's start-up takes longer than the half it would save.
const PARALLEL_PARSE_BYTES = 4 << 20;
// The worker's share of the bytes left at the split: a little over half, as this thread also reads
// the file for itself and takes the worker's rows in (10M-sample profiles: at one half the worker
// finished its part 0.2-0.4 s before this thread).
const WORKER_SHARE = 0.55;

/**
 * Hands the data rows from the first line feed past the worker's share of what is left to the
 * worker, into the room the importer sets aside for them; undefined when the header is not read
 * yet or the file is too short to bother.
 */
function startSecondHalf(worker: Worker, fd: number, path: string, importer: CaptureImporter, position: number, size: number) {
  const known = importer.rowLayout();
  if (!known || known.rowsSoFar < 2 || size - position < PARALLEL_PARSE_BYTES / 2) return undefined;
  const middle = position + Math.floor((size - position) * WORKER_SHARE);
  const probe = new Uint8Array(1 << 16);
  const newline = probe.subarray(0, readSync(fd, probe, 0, probe.length, middle)).indexOf(0x0a);
  if (newline < 0) return undefined;
  const startByte = middle + newline + 1;
  const bytesPerRow = (position - known.dataStartByte) / known.rowsSoFar;
  // The rows before the split, with room to spare: the importer moves elsewhere if it needs more.
  const firstRow = Math.ceil(((startByte - known.dataStartByte) / bytesPerRow) * 1.03) + 1024;
  const channels = importer.releaseTail(firstRow);
  const capacity = Math.ceil(((size - startByte) / bytesPerRow) * 1.15) + 1024;
  const done = new SharedArrayBuffer(4);
  const { port1, port2 } = new MessageChannel();
  const expectedSamples = Math.round((size - known.dataStartByte) / bytesPerRow);
  worker.postMessage({ kind: "parse", path, startByte, layout: known.layout, channels, capacity, expectedSamples, port: port2, done }, [port2]);
  const wait = (): ParsedRows | undefined => {
    const reply = awaitWorker(done, port1) as { rows?: ParsedRows; inPlace?: boolean } | undefined;
    const rows = reply?.rows;
    // Our own views of the arrays the worker filled, so the importer sees they are its own buffer.
    if (rows && reply?.inPlace && channels) rows.channels = channels.map((c) => c.subarray(0, rows.count));
    return rows;
  };
  return { startByte, wait };
}

/** Streams the file through the importer in 1 MB chunks: the text never sits in memory whole. */
function importFile(path: string, worker?: Worker) {
  let fd: number;
  try {
    fd = openSync(path, "r");
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new CaptureImportError(`cannot read ${path}: ${code === "ENOENT" ? "no such file" : (code ?? "unreadable")}`);
  }
  try {
    const stat = fstatSync(fd);
    if (stat.isDirectory()) throw new CaptureImportError(`cannot read ${path}: it is a directory`);
    const importer = new CaptureImporter({ sizeHintBytes: stat.size, sharedMemory: worker !== undefined });
    const buffer = new Uint8Array(CHUNK_BYTES);
    const parallel = worker !== undefined && stat.size >= PARALLEL_PARSE_BYTES;
    let secondHalf: ReturnType<typeof startSecondHalf>;
    let position = 0;
    const pushUpTo = (end: number) => {
      while (position < end) {
        const read = readSync(fd, buffer, 0, Math.min(CHUNK_BYTES, end - position), position);
        if (read === 0) break;
        position += read;
        // The importer copies what it keeps, so one buffer serves every chunk.
        importer.push(buffer.subarray(0, read));
        // Split only once the worker is up: sharing out what is left then keeps the two parts even
        // however long its start-up took (a fixed split left this thread waiting for it).
        if (parallel && !secondHalf && end === Infinity && isReady(worker)) {
          secondHalf = startSecondHalf(worker, fd, path, importer, position, stat.size);
          if (secondHalf) end = secondHalf.startByte;
        }
      }
    };
    pushUpTo(Infinity);
    // The worker's rows, or, when it could not take them (a bad row), its half through the importer, which words the error.
    if (secondHalf) {
      const rows = secondHalf.wait();
      if (!(rows && importer.pushParsedRows(rows))) pushUpTo(Infinity);
    }
    return importer.finish();
  } finally {
    closeSync(fd);
  }
}

function formatHz(hz: number): string {
  const abs = Math.abs(hz);
  if (abs >= 1e9) return `${(hz / 1e9).toPrecision(9)} GHz`;
  if (abs >= 1e6) return `${(hz / 1e6).toPrecision(9)} MHz`;
  if (abs >= 1e3) return `${(hz / 1e3).toPrecision(9)} kHz`;
  return `${hz.toPrecision(9)} Hz`;
}

function formatDb(value: number | null, unit: string): string {
  return value === null ? "—" : `${value.toFixed(2)} ${unit}`;
}

function thdText(result: AnalysisResult): string {
  const orders = `orders 2–${result.harmonicOrdersRequested}`;
  if (result.thdPercent === null) return `not measured: ${result.thd.note ?? "no figure"} (${orders})`;
  const floor = result.thd.floorPercent > 0 ? `; noise floor ${result.thd.floorPercent.toPrecision(2)} %` : "";
  return `${result.thdPercent.toPrecision(4)} % (${formatDb(result.thdDb, "dB")}, over detected ${result.thd.detectedOrders.join(", ")} of ${orders}${floor})`;
}

function harmonicText(h: AnalysisResult["harmonics"][number]): string {
  const where = h.folded ? `${formatHz(h.frequencyHz)} (seen at ${formatHz(h.seenAtHz)}, folded)` : formatHz(h.frequencyHz);
  if (h.status === "measured") return `${where}  ${(h.amplitudeVpk as number).toExponential(3)} Vpk  ${formatDb(h.dBc, "dBc")}`;
  if (h.status === "below-detection") return `${where}  < ${formatDb(h.detectionLimitDbc, "dBc")} (under the noise)`;
  return `${where}  not measured: ${h.note}`;
}

function table(result: AnalysisResult): string {
  const spur = result.largestSpur;
  const rows: [string, string][] = [
    ["channel", `${result.channel} (${result.samples} samples at ${formatSampleRate(result.sampleRateHz)})`],
    ["frequency", `${formatHz(result.frequencyHz)} ± ${result.frequencyUncertaintyHz.toPrecision(3)} Hz (1σ statistical)`],
    ["fundamental", `${result.fundamentalVpk.toPrecision(5)} Vpk`],
    ["Vpp / Vrms / DC", `${result.vpp.toPrecision(5)} V / ${result.vrms.toPrecision(5)} V / ${result.dcV.toPrecision(4)} V`],
    ["THD", thdText(result)],
    ["SINAD / SNR", `${formatDb(result.sinadDb, "dB")} / ${formatDb(result.snrDb, "dB")}`],
    ["SFDR / ENOB", `${formatDb(result.sfdrDb, "dBc")}${spur ? ` (against ${spur.label} at ${formatHz(spur.frequencyHz)})` : ""} / ${result.enob === null ? "—" : result.enob.toFixed(2)}`],
  ];
  for (const h of result.harmonics) rows.push([`  H${h.order}`, harmonicText(h)]);
  for (const s of result.spurs) rows.push([`  spur`, `${formatHz(s.frequencyHz)}  ${formatDb(s.dBc, "dBc")}  ${s.label}`]);
  if (result.twoChannel) {
    const tc = result.twoChannel;
    const figures = tc.gainDb === null || tc.phaseDeg === null ? `not measured: ${tc.reason}` : `${tc.gainDb.toFixed(2)} dB, ${tc.phaseDeg.toFixed(2)}°`;
    rows.push([`${tc.channel} vs ${tc.referenceChannel}`, figures]);
  }
  rows.push(...stabilityLines(result.stability));
  const width = Math.max(...rows.map(([label]) => label.length));
  const lines = rows.map(([label, value]) => `${label.padEnd(width)}  ${value}`);
  for (const w of result.warnings) lines.push(`warning [${w.code}] ${w.message}`);
  return lines.join("\n") + "\n";
}

/**
 * Blocks until the worker has answered on `port` (0 in the flag: not picked up yet, 1: working,
 * 2: done). A worker that has not picked the job up within a couple of seconds is not coming; one
 * that has is given as long as the work can take. undefined when there is no answer.
 */
function awaitWorker(done: SharedArrayBuffer, port: MessagePort): unknown {
  const flag = new Int32Array(done);
  Atomics.wait(flag, 0, 0, WORKER_START_MS);
  if (Atomics.load(flag, 0) === 1) Atomics.wait(flag, 0, 1, WORKER_WAIT_MS);
  const reply = receiveMessageOnPort(port)?.message;
  port.close();
  return reply;
}

// Records this long are worth a second thread for their spectrum; shorter ones finish before it starts.
const PARALLEL_SPECTRUM_SAMPLES = 200_000;
const WORKER_START_MS = 2_000;
const WORKER_WAIT_MS = 120_000;

/** Per worker, a shared flag it sets to 1 once it is loaded and listening. */
const workerReady = new WeakMap<Worker, Int32Array>();
// For tests of the two-thread import on small files, which this thread would otherwise read
// whole before the worker is up: wait (up to the usual two seconds) for the worker at the first chunk.
const WAIT_FOR_WORKER = process.env.TANKBOOK_ANALYZE_WAIT_FOR_WORKER === "1";

let waitedForWorker = false;

function isReady(worker: Worker): boolean {
  const flag = workerReady.get(worker);
  if (!flag) return false;
  if (WAIT_FOR_WORKER && !waitedForWorker) {
    waitedForWorker = true;
    Atomics.wait(flag, 0, 0, WORKER_START_MS);
  }
  return Atomics.load(flag, 0) === 1;
}

/** The spectrum worker, started before the file is read so its start-up overlaps the import. */
function startSpectrumWorker(): Worker | undefined {
  // Only from the bundle (scripts/run-analyze.mjs): under tsx a worker loads its .ts through the
  // main thread's loader, which cannot answer while the main thread waits for the worker.
  if (import.meta.url.endsWith(".ts")) return undefined;
  try {
    const ready = new Int32Array(new SharedArrayBuffer(4));
    const worker = new Worker(new URL("./analyze-spectrum-worker.mjs", import.meta.url), { workerData: { ready: ready.buffer } });
    workerReady.set(worker, ready);
    worker.unref();
    worker.on("error", () => undefined); // a failed worker only means computing the spectrum here
    return worker;
  } catch {
    return undefined;
  }
}

// The engine's coarse frequency comes from the first 2^16 samples (lib/analysis/analyze-capture.ts);
// the worker's spectrum of them is used only if the engine asks for exactly that head.
const HEAD_SAMPLES = 1 << 16;

/**
 * spectrumOf and headSpectrumOf for analyzeCapture that hand the work to the worker right away
 * (the head first: it is asked for first) and, when the engine asks for a result, block until the
 * worker has it (or compute it here if the worker failed).
 */
function spectraFromWorker(worker: Worker, capture: Capture, options: AnalyzeOptions): Pick<AnalyzeOptions, "spectrumOf" | "headSpectrumOf"> {
  const { channel } = analysisChannels(capture, options);
  // The importer kept the samples in shared memory; a copy only when it could not.
  let samples = channel.samples.buffer;
  let byteOffset = channel.samples.byteOffset;
  if (!(samples instanceof SharedArrayBuffer)) {
    samples = new SharedArrayBuffer(channel.samples.length * 8);
    new Float64Array(samples).set(channel.samples);
    byteOffset = 0;
  }
  const ask = (length: number, maxFftLength: number | undefined) => {
    const done = new SharedArrayBuffer(4);
    const { port1, port2 } = new MessageChannel();
    worker.postMessage({ samples, byteOffset, length, sampleRateHz: capture.sampleRateHz, maxFftLength, port: port2, done }, [port2]);
    return () => (awaitWorker(done, port1) as { spectrum?: Spectrum } | undefined)?.spectrum;
  };
  const headLength = Math.min(HEAD_SAMPLES, channel.samples.length);
  const head = ask(headLength, undefined);
  const whole = ask(channel.samples.length, options.maxFftLength);
  return {
    headSpectrumOf: (y, sampleRateHz) => {
      const ours = y.length === headLength && y.buffer === channel.samples.buffer && y.byteOffset === channel.samples.byteOffset;
      return (ours ? head() : undefined) ?? windowedSpectrum(y, sampleRateHz);
    },
    spectrumOf: (y, sampleRateHz, maxFftLength) => {
      const spectrum = whole();
      void worker.terminate();
      return spectrum ?? windowedSpectrum(y, sampleRateHz, { maxFftLength });
    },
  };
}

function main(argv: string[]): number {
  try {
    const args = parseArguments(argv);
    const worker = startSpectrumWorker();
    const capture = applyProbeAttenuation(importFile(args.file, worker), args.probe);
    const options: AnalyzeOptions = { channel: args.channel, harmonics: args.harmonics, plot: false };
    if (worker && capture.samples >= PARALLEL_SPECTRUM_SAMPLES) Object.assign(options, spectraFromWorker(worker, capture, options));
    else void worker?.terminate();
    const { result } = analyzeCapture(capture, options);
    process.stdout.write(args.json ? JSON.stringify(result) + "\n" : table(result));
    return 0;
  } catch (error) {
    if (error instanceof HelpRequested) {
      process.stdout.write(HELP);
      return 0;
    }
    const known = error instanceof CaptureImportError || error instanceof UsageError;
    const message = error instanceof Error ? error.message : String(error);
    process.stderr.write(`analyze: ${known ? "" : "internal error: "}${message.replace(/\s*\n\s*/g, " ")}\n`);
    return error instanceof UsageError ? 2 : 1;
  }
}

// A reader that stops early (`| head`) is not an error of ours: end quietly instead of printing a stack.
process.stdout.on("error", (error: NodeJS.ErrnoException) => {
  if (error.code === "EPIPE") process.exit(process.exitCode ?? 0);
  throw error;
});

process.exitCode = main(process.argv.slice(2));
