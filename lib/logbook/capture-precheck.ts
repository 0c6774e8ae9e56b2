import { BadRequestError } from "@/lib/errors";
import { checkCaptureStart, SNIFF_BYTES } from "@/lib/capture-sniff/sniff-header";
import { deleteObject, getObjectStream } from "@/lib/storage";

/** The first `limitBytes` of a stored object (fewer when it is shorter), without reading the rest. */
async function readObjectStart(objectKey: string, limitBytes: number): Promise<Uint8Array> {
  const stream = await getObjectStream(objectKey);
  const chunks: Buffer[] = [];
  let length = 0;
  try {
    for await (const chunk of stream as AsyncIterable<Buffer>) {
      chunks.push(chunk);
      length += chunk.length;
      if (length >= limitBytes) break;
    }
  } finally {
    stream.destroy();
  }
  return new Uint8Array(Buffer.concat(chunks).subarray(0, limitBytes));
}

/**
 * Refuses a stored capture the importer cannot read, before any run row exists: the same check the upload form
 * runs in the browser (lib/capture-sniff) on the same first 64 kB, so a PNG, a page of notes or a header-only
 * export is a clear 400 instead of a run that fails its analysis for good. The object is removed on refusal.
 * @param sizeBytes - the stored object's size, to know whether the first bytes are the whole file
 * @throws BadRequestError naming what the importer could not read
 */
export async function refuseUnreadableCapture(objectKey: string, sizeBytes: number): Promise<void> {
  await refuseUnreadableStart(objectKey, await readObjectStart(objectKey, SNIFF_BYTES), sizeBytes);
}

/**
 * {@link refuseUnreadableCapture} on the first bytes already in hand (kept while the upload streamed through), so
 * the object is not read back from storage.
 * @param start - the file's first min(SNIFF_BYTES, size) bytes
 */
export async function refuseUnreadableStart(objectKey: string, start: Uint8Array, sizeBytes: number): Promise<void> {
  const result = checkCaptureStart(start.subarray(0, SNIFF_BYTES), sizeBytes <= SNIFF_BYTES);
  if (result.ok) return;
  await deleteObject(objectKey).catch(() => undefined);
  throw new BadRequestError(`This file cannot be analysed, so no run was logged: ${result.message}`, { file: [result.message] });
}
