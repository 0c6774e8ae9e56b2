import { describe, expect, it } from "vitest";
import { analyseCaptureChunks } from "@/lib/jobs/analysis-task";
import { synthCaptureCsv } from "../../helpers/signals";

const CAPTURE = synthCaptureCsv({ frequencyHz: 1000, sampleRateHz: 100_000, samples: 4096, amplitudeV: 1, noiseVrms: 0.001, seed: 5 });

function chunksOf(text: string, size: number): Uint8Array[] {
  const bytes = new TextEncoder().encode(text);
  const chunks: Uint8Array[] = [];
  for (let at = 0; at < bytes.length; at += size) chunks.push(bytes.subarray(at, at + size));
  return chunks;
}

const RUN = { sizeBytes: CAPTURE.length, channel: null, probeAttenuation: 1 };

describe("analyseCaptureChunks", () => {
  it("returns the result of a good capture", async () => {
    const output = await analyseCaptureChunks(chunksOf(CAPTURE, 5000), RUN);
    if (!output.ok) throw new Error(output.message);
    expect(output.result.frequencyHz / 1000 - 1).toBeLessThan(1e-6);
  });

  it("turns an importer refusal into ok false with the importer's own message", async () => {
    const csv = `Time (s),Out (V)\n${Array.from({ length: 100 }, (_, i) => `${(i * 1e-310).toExponential(6)},0`).join("\n")}\n`;
    const output = await analyseCaptureChunks(chunksOf(csv, 1000), { ...RUN, sizeBytes: csv.length });
    expect(output).toMatchObject({ ok: false, message: "line 3: sample interval 1e-310 s is too small to give a finite sample rate" });
  });

  it("turns an engine exception that is not an import error into ok false with its message, without throwing", async () => {
    // The engine's RangeError for an attenuation below 1 (upload validation never stores one): a real throw
    // from inside the engine, not from the importer.
    const output = await analyseCaptureChunks(chunksOf(CAPTURE, 5000), { ...RUN, probeAttenuation: 0.5 });
    expect(output.ok).toBe(false);
    if (output.ok) return;
    expect(output.message).toBe(
      "The analysis engine could not handle this capture (probe attenuation must be a finite number of at least 1, got 0.5). " +
        "The capture is kept; re-analyse after the engine is fixed.",
    );
  });

  it("throws what the chunks' source throws, for the queue to retry", async () => {
    async function* failingSource(): AsyncGenerator<Uint8Array> {
      yield new TextEncoder().encode("Time (s),Out (V)\n0,0\n");
      throw new Error("socket hang up");
    }
    await expect(analyseCaptureChunks(failingSource(), RUN)).rejects.toThrow("socket hang up");
  });
});
