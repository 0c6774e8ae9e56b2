import { createWriteStream, existsSync, mkdirSync, readFileSync, renameSync, writeFileSync } from "node:fs";
import path from "node:path";
import { type SynthCaptureOptions, synthCaptureChunks } from "../lib/synth-capture";

/** Where the benchmark keeps its generated captures (git-ignored). */
export const BENCH_DATA_DIR = path.resolve(import.meta.dirname, "../../bench-data");

/**
 * A realistic three-column capture (time, output, base): a 1.234567 MHz oscillator sampled at
 * 100 MS/s, non-coherent, with harmonics, noise, a DC offset and a second channel at −8 dB, 172°.
 */
export function benchCaptureOptions(samples: number): SynthCaptureOptions {
  return {
    frequencyHz: 1_234_567.89,
    sampleRateHz: 100e6,
    samples,
    amplitudeV: 1.2,
    dcV: 0.35,
    harmonicsDbc: [-32, -41, -55, -60, -66, -70, -75, -78, -80],
    noiseVrms: 0.002,
    seed: 20240601,
    second: { name: "Base", gainDb: -8, phaseDeg: 172, noiseVrms: 0.0015, dcV: 0.62 },
    channelName: "Out",
    timeUnit: "s",
  };
}

/**
 * Writes the capture once and reuses it while its options are unchanged.
 * @returns the file's path
 */
export async function ensureBenchCapture(name: string, samples: number): Promise<string> {
  mkdirSync(BENCH_DATA_DIR, { recursive: true });
  const file = path.join(BENCH_DATA_DIR, name);
  const stamp = `${file}.options.json`;
  const options = benchCaptureOptions(samples);
  const wanted = JSON.stringify(options);
  if (existsSync(file) && existsSync(stamp) && readFileSync(stamp, "utf8") === wanted) return file;
  const partial = `${file}.partial`;
  const out = createWriteStream(partial);
  for (const chunk of synthCaptureChunks(options, 65536)) {
    if (!out.write(chunk)) await new Promise<void>((resolve) => out.once("drain", () => resolve()));
  }
  await new Promise<void>((resolve, reject) => out.end((error?: Error | null) => (error ? reject(error) : resolve())));
  renameSync(partial, file);
  writeFileSync(stamp, wanted);
  return file;
}
