// Runs inside a piscina worker thread: streams a capture from storage, imports and analyses it, off the main
// event loop. Bad input comes back as { ok: false, message } (custom error classes do not survive the thread
// boundary); anything thrown is a transient or unexpected failure and is retried by the queue.
import {
  CaptureImportError,
  CaptureImporter,
  ENGINE_VERSION,
  analyzeCapture,
  analyzeSamples,
  type AnalysisResult,
  type PlotData,
} from "@/lib/analysis";
import { getObjectStream } from "@/lib/storage";

export interface AnalysisTaskInput {
  objectKey: string;
  sizeBytes: number;
  /** Channel chosen at upload; null for the engine's default (the first voltage column). */
  channel: string | null;
  /** Fit the first and last thirds too, for a spec that limits the drift within one record. */
  measureInRecordDrift: boolean;
}

export type AnalysisTaskOutput =
  | { ok: true; engineVersion: string; result: AnalysisResult; plot: PlotData; inRecordDriftPpm: number | null }
  | { ok: false; engineVersion: string; message: string };

/** Shortest part of a record worth fitting on its own. */
const MIN_THIRD_SAMPLES = 256;

function thirdFrequencyHz(samples: Float64Array, sampleRateHz: number): number | null {
  try {
    return analyzeSamples(samples, sampleRateHz, { harmonics: 2, waveformPoints: 16, spectrumPoints: 16 }).result.frequencyHz;
  } catch (err) {
    if (err instanceof CaptureImportError) return null;
    throw err;
  }
}

/**
 * Frequency of the last third minus the first third, relative to the whole record's, in ppm.
 * @returns null when a third is too short to fit or holds no oscillation
 */
function inRecordDriftPpm(samples: Float64Array, sampleRateHz: number, frequencyHz: number): number | null {
  const third = Math.floor(samples.length / 3);
  if (third < MIN_THIRD_SAMPLES) return null;
  const first = thirdFrequencyHz(samples.subarray(0, third), sampleRateHz);
  const last = thirdFrequencyHz(samples.subarray(samples.length - third), sampleRateHz);
  if (first === null || last === null) return null;
  return ((last - first) / frequencyHz) * 1e6;
}

export default async function analyseCaptureObject(input: AnalysisTaskInput): Promise<AnalysisTaskOutput> {
  const stream = await getObjectStream(input.objectKey);
  try {
    const importer = new CaptureImporter({ sizeHintBytes: input.sizeBytes });
    for await (const chunk of stream) importer.push(chunk as Uint8Array);
    const capture = importer.finish();
    const { result, plot } = analyzeCapture(capture, input.channel ? { channel: input.channel } : {});
    let drift: number | null = null;
    if (input.measureInRecordDrift) {
      const channel = capture.channels.find((c) => c.name === result.channel) ?? capture.channels[0];
      drift = inRecordDriftPpm(channel.samples, capture.sampleRateHz, result.frequencyHz);
    }
    return { ok: true, engineVersion: ENGINE_VERSION, result, plot, inRecordDriftPpm: drift };
  } catch (err) {
    if (err instanceof CaptureImportError) return { ok: false, engineVersion: ENGINE_VERSION, message: err.message };
    throw err;
  } finally {
    stream.destroy();
  }
}
