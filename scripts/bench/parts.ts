/**
 * One cold run of the analysis, stage by stage, in a fresh process (so every stage pays its own
 * JIT warm-up, as the `analyze` command does). Prints one JSON object of milliseconds.
 *
 *   npx tsx scripts/bench/parts.ts FILE
 */
import { closeSync, fstatSync, openSync, readSync } from "node:fs";
import { analyzeCapture, CaptureImporter } from "../../lib/analysis";

const CHUNK_BYTES = 1 << 20;

function readOnlyMs(path: string): number {
  const start = performance.now();
  const fd = openSync(path, "r");
  const buffer = new Uint8Array(CHUNK_BYTES);
  while (readSync(fd, buffer, 0, CHUNK_BYTES, null) > 0);
  closeSync(fd);
  return performance.now() - start;
}

const file = process.argv[2];
if (!file) {
  process.stderr.write("usage: parts.ts FILE\n");
  process.exit(2);
}
const readMs = readOnlyMs(file);
const started = performance.now();
const fd = openSync(file, "r");
const importer = new CaptureImporter({ sizeHintBytes: fstatSync(fd).size });
const buffer = new Uint8Array(CHUNK_BYTES);
for (;;) {
  const read = readSync(fd, buffer, 0, CHUNK_BYTES, null);
  if (read === 0) break;
  importer.push(buffer.subarray(0, read));
}
closeSync(fd);
const capture = importer.finish();
const readAndImportMs = performance.now() - started;
const analysisStarted = performance.now();
const { timings } = analyzeCapture(capture, { collectTimings: true });
const analysisMs = performance.now() - analysisStarted;
process.stdout.write(
  JSON.stringify({
    readMs,
    importMs: Math.max(0, readAndImportMs - readMs),
    analysisMs,
    ...timings,
    maxRssMB: process.resourceUsage().maxRSS / 1024,
  }) + "\n",
);
