import type { Readable } from "node:stream";
import { applyProbeAttenuation, CaptureImporter, CaptureImportError } from "@/lib/analysis";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { BadRequestError, ConflictError } from "@/lib/errors";
import { getObjectStream } from "@/lib/storage";
import { EXCERPT_MAX_SAMPLES, type RunExcerptQuery } from "@/lib/validations/run-excerpt";
import { getRun } from "./runs";

/** Raw samples of the analysed channel inside a time window, in volts at the circuit (probe applied). */
export interface RunExcerpt {
  channel: string;
  sampleRateHz: number;
  /** Time of each sample, s, on the capture's own axis (the waveform envelope's). */
  timeS: number[];
  volts: number[];
}

async function importStored(stream: Readable, sizeBytes: number) {
  const importer = new CaptureImporter({ sizeHintBytes: sizeBytes });
  for await (const chunk of stream as AsyncIterable<Buffer>) importer.push(chunk);
  return importer.finish();
}

/**
 * Reads the stored capture of an analysed run and returns its samples between `fromS` and `toS` (inclusive), for
 * the waveform chart once a zoom shows fewer samples than the envelope has points. Any signed-in role.
 * @throws NotFoundError; ConflictError before the analysis is done; BadRequestError when the window holds more than
 *   {@link EXCERPT_MAX_SAMPLES} samples or none, naming the count
 */
export async function getRunExcerpt(user: CurrentUser | null, runId: string, window: RunExcerptQuery): Promise<RunExcerpt> {
  const run = await getRun(user, runId);
  if (run.status !== "done") throw new ConflictError("The run is not analysed yet; its samples can be read once the analysis is done.");
  let capture;
  try {
    capture = applyProbeAttenuation(await importStored(await getObjectStream(run.objectKey), run.sizeBytes), run.probeAttenuation);
  } catch (err) {
    // The analysis read this file; a file it cannot read now means it was re-analysed to failure meanwhile.
    if (err instanceof CaptureImportError) throw new ConflictError(`The stored capture cannot be read: ${err.message}`);
    throw err;
  }
  const analysed = typeof run.results?.channel === "string" ? run.results.channel : run.channel;
  const channel = capture.channels.find((c) => c.name === analysed) ?? capture.channels[0];
  const fs = capture.sampleRateHz;
  const first = Math.max(0, Math.ceil((window.fromS - capture.startTimeS) * fs - 1e-9));
  const last = Math.min(capture.samples - 1, Math.floor((window.toS - capture.startTimeS) * fs + 1e-9));
  const count = last - first + 1;
  if (count <= 0) throw new BadRequestError("No samples in that window: it lies outside the record.", { fromS: ["outside the record"] });
  if (count > EXCERPT_MAX_SAMPLES) {
    throw new BadRequestError(`That window holds ${count} samples; an excerpt holds at most ${EXCERPT_MAX_SAMPLES}. Zoom in further.`, {
      toS: [`at most ${EXCERPT_MAX_SAMPLES} samples`],
    });
  }
  const timeS: number[] = new Array(count);
  const volts: number[] = new Array(count);
  for (let k = 0; k < count; k++) {
    timeS[k] = capture.startTimeS + (first + k) / fs;
    volts[k] = channel.samples[first + k];
  }
  return { channel: channel.name, sampleRateHz: fs, timeS, volts };
}
