import { createHash } from "node:crypto";
import { Transform, type Readable } from "node:stream";
import { getObjectStream } from "@/lib/storage";
import { PayloadTooLargeError, UnsupportedMediaTypeError } from "@/lib/errors";
import { formatEngineering } from "@/lib/oscillator";
import { CAPTURE_CONTENT_TYPES, CAPTURE_EXTENSIONS } from "@/lib/validations/run";

/** Bytes as people read them: "512 MB" (decimal prefixes, as upload dialogs show). */
export function formatBytes(bytes: number): string {
  return bytes < 1000 ? `${bytes} bytes` : formatEngineering(bytes, "B", 3, { trimZeros: true });
}

/** The upload limit (UPLOAD_LIMIT_BYTES), read when asked so tests can change it. */
export function uploadLimitBytes(): number {
  const value = Number(process.env.UPLOAD_LIMIT_BYTES ?? 500_000_000);
  return Number.isFinite(value) && value > 0 ? value : 500_000_000;
}

/** @throws PayloadTooLargeError naming both sizes */
export function checkCaptureSize(sizeBytes: number, limit = uploadLimitBytes()): void {
  if (sizeBytes > limit) {
    // In bytes as well: rounded to three digits, 500,000,001 bytes reads "500 MB" and would contradict the limit.
    const over = sizeBytes - limit;
    throw new PayloadTooLargeError(
      `The file is ${sizeBytes.toLocaleString("en-US")} bytes, ${over.toLocaleString("en-US")} byte${over === 1 ? "" : "s"} over the capture limit of ${formatBytes(limit)} (${limit.toLocaleString("en-US")} bytes).`,
    );
  }
}

/**
 * A capture must be a text table by name and, when the client says, by type; the content itself is checked by
 * the importer when the run is analysed.
 * @throws UnsupportedMediaTypeError
 */
export function checkCaptureFile(filename: string, contentType: string | undefined | null): void {
  const lower = filename.toLowerCase();
  if (!CAPTURE_EXTENSIONS.some((ext) => lower.endsWith(ext))) {
    throw new UnsupportedMediaTypeError(`Only CSV captures (${CAPTURE_EXTENSIONS.join(", ")}) can be uploaded; “${filename}” is not one.`);
  }
  const type = (contentType ?? "").split(";")[0].trim().toLowerCase();
  if (type && !type.startsWith("text/") && !(CAPTURE_CONTENT_TYPES as readonly string[]).includes(type)) {
    throw new UnsupportedMediaTypeError(`A capture is a CSV text file; this one was sent as ${type}.`);
  }
}

/** SHA-256 (hex) of a stored object, streamed so a large capture never sits in memory. */
export async function sha256OfObject(key: string): Promise<string> {
  const hash = createHash("sha256");
  const stream = await getObjectStream(key);
  for await (const chunk of stream) hash.update(chunk as Uint8Array);
  return hash.digest("hex");
}

/** A pass-through that hashes and counts what flows through it and stops past `limitBytes`. */
export interface MeteredStream {
  stream: Transform;
  /** Final values; valid once the stream has ended. */
  result(): { sha256: string; sizeBytes: number };
  tooLarge(): boolean;
}

export function meterStream(source: Readable, limitBytes: number): MeteredStream {
  const hash = createHash("sha256");
  let size = 0;
  let over = false;
  let digest: string | null = null;
  const stream = new Transform({
    transform(chunk: Buffer, _encoding, done) {
      size += chunk.length;
      if (size > limitBytes) {
        over = true;
        done(new PayloadTooLargeError(`The file is over the ${formatBytes(limitBytes)} capture limit.`));
        return;
      }
      hash.update(chunk);
      done(null, chunk);
    },
  });
  source.on("error", (err) => stream.destroy(err));
  // A source that failed before it was handed over would never end the pipe: fail the metered stream too.
  if (source.errored) process.nextTick(() => stream.destroy(source.errored ?? undefined));
  else source.pipe(stream);
  return {
    stream,
    result() {
      digest ??= hash.digest("hex");
      return { sha256: digest, sizeBytes: size };
    },
    tooLarge: () => over,
  };
}
