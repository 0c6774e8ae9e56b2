// Runs inside a piscina worker thread: streams a capture from storage, imports and analyses it, off the main
// event loop. Whatever the engine throws comes back as { ok: false, message } (custom error classes do not
// survive the thread boundary): it is pure code, so a retry would only throw the same again. Only storage
// failures are thrown, for the queue to retry.
import {
  CaptureImportError,
  CaptureImporter,
  ENGINE_VERSION,
  analyzeCapture,
  applyProbeAttenuation,
  type AnalysisResult,
  type PlotData,
} from "@/lib/analysis";
import { getObjectStream } from "@/lib/storage";

export interface AnalysisTaskInput {
  objectKey: string;
  sizeBytes: number;
  /** Channel chosen at upload; null for the engine's default (the first voltage column). */
  channel: string | null;
  /** The probe's attenuation given at upload: the file's volts are multiplied by it (1 when the scope scaled them). */
  probeAttenuation: number;
}

export type AnalysisTaskOutput =
  | { ok: true; engineVersion: string; result: AnalysisResult; plot: PlotData }
  | { ok: false; engineVersion: string; message: string };

/** Something the engine threw: a fault of the capture or of the engine, never of the infrastructure. */
class EngineFailure extends Error {}

function inEngine<T>(work: () => T): T {
  try {
    return work();
  } catch (err) {
    if (err instanceof CaptureImportError) throw new EngineFailure(err.message);
    const detail = err instanceof Error ? err.message : String(err);
    throw new EngineFailure(`The analysis engine could not handle this capture (${detail}). The capture is kept; re-analyse after the engine is fixed.`);
  }
}

/**
 * Imports and analyses a capture given as chunks, turning anything the importer or the engine throws into
 * { ok: false, message }; only a failure of the chunks' source (storage) is thrown.
 *
 * @param chunks - the capture file's bytes, in order
 * @param input - the size hint, channel and probe attenuation of the run (its object key is not read)
 * @returns the result and plot, or the message the run is failed with
 * @throws whatever reading `chunks` throws
 */
export async function analyseCaptureChunks(
  chunks: AsyncIterable<Uint8Array> | Iterable<Uint8Array>,
  input: Omit<AnalysisTaskInput, "objectKey">,
): Promise<AnalysisTaskOutput> {
  try {
    const importer = new CaptureImporter({ sizeHintBytes: input.sizeBytes });
    for await (const chunk of chunks) inEngine(() => importer.push(chunk));
    return inEngine(() => {
      const capture = applyProbeAttenuation(importer.finish(), input.probeAttenuation);
      const { result, plot } = analyzeCapture(capture, input.channel ? { channel: input.channel } : {});
      return { ok: true as const, engineVersion: ENGINE_VERSION, result, plot };
    });
  } catch (err) {
    if (err instanceof EngineFailure) return { ok: false, engineVersion: ENGINE_VERSION, message: err.message };
    throw err;
  }
}

export default async function analyseCaptureObject(input: AnalysisTaskInput): Promise<AnalysisTaskOutput> {
  const stream = await getObjectStream(input.objectKey);
  try {
    return await analyseCaptureChunks(stream as AsyncIterable<Uint8Array>, input);
  } finally {
    stream.destroy();
  }
}
