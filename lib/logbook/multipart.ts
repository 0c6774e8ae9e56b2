import { PassThrough, Readable } from "node:stream";
import type { ReadableStream as NodeWebReadableStream } from "node:stream/web";
import busboy from "busboy";
import { BadRequestError, UnsupportedMediaTypeError } from "@/lib/errors";

/** The capture part of a multipart request, as a stream, and the text fields (complete once the file is read). */
export interface MultipartCapture {
  file: Promise<{ stream: Readable; filename: string; mimeType: string }>;
  /** Resolves after the whole body was read (busboy finishes only once the file stream is consumed). */
  fields: Promise<Record<string, string>>;
}

/** Longest file name kept, in characters: the same cap upload slots put on names. */
export const FILENAME_MAX_CHARS = 255;

/**
 * Why a file name (from `filename` or RFC 5987 `filename*`) cannot be stored, or null: NUL and lone UTF-16
 * surrogates have no place in PostgreSQL text, and names longer than the slots' cap are refused rather than cut.
 */
export function filenameProblem(filename: string): string | null {
  if (filename.includes("\u0000")) return "The file name contains the NUL character (U+0000).";
  if (/[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/.test(filename)) {
    return "The file name is not valid Unicode (it holds a lone surrogate).";
  }
  const length = [...filename].length;
  if (length > FILENAME_MAX_CHARS) return `The file name is ${length} characters long; ${FILENAME_MAX_CHARS} at most. Rename the file and upload it again.`;
  return null;
}

/**
 * Parses a multipart/form-data request with busboy as it arrives: the file field `fileField` is handed over as
 * a stream (never buffered), other files are drained, text fields are collected.
 * @throws UnsupportedMediaTypeError when the request is not multipart; the promises reject with BadRequestError
 *   when there is no file field or the body is malformed
 */
export function readMultipartCapture(request: Request, fileField = "file"): MultipartCapture {
  const type = request.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("multipart/form-data")) {
    throw new UnsupportedMediaTypeError(`Send the capture as multipart/form-data with the file in the field “${fileField}”.`);
  }
  if (!request.body) throw new BadRequestError(`The request has no body; put the capture in the field “${fileField}”.`);
  let parser: busboy.Busboy;
  try {
    // Clients write a file name's UTF-8 bytes as they are (curl, browsers); busboy would read them as Latin-1.
    parser = busboy({ headers: { "content-type": type }, defParamCharset: "utf8", limits: { files: 5, fields: 30, fieldSize: 16 * 1024 } });
  } catch (err) {
    throw new BadRequestError(`The multipart body cannot be read: ${err instanceof Error ? err.message : String(err)}.`);
  }
  const fields: Record<string, string> = {};
  let fileSeen = false;
  const malformed = (err: unknown) => new BadRequestError(`The multipart body cannot be read: ${err instanceof Error ? err.message : String(err)}.`);
  const body = Readable.fromWeb(request.body as unknown as NodeWebReadableStream);
  body.on("error", (err) => parser.destroy(err));
  // After a parse error the rest of the body is read and dropped (for up to 2 s) before the error is reported,
  // so the 400 goes out once the client has finished sending instead of resetting it mid-write.
  const drained = new Promise<void>((resolve) => {
    parser.on("error", () => {
      body.unpipe(parser);
      if (body.readableEnded || body.destroyed) return resolve();
      const timer = setTimeout(resolve, 2_000);
      const finish = () => {
        clearTimeout(timer);
        resolve();
      };
      body.once("end", finish);
      body.once("close", finish);
      body.once("error", finish);
      body.resume();
    });
  });
  const failAfterDrain = (reject: (err: unknown) => void) => (err: unknown) => void drained.then(() => reject(malformed(err)));
  // busboy emits "close" right after "error"; the rejection waits for the drain, so "close" must not resolve first.
  let parseFailed = false;
  // The capture's stream as handed to the caller; the pipe ends it (writableEnded) once it has had all its bytes.
  let captureOut: PassThrough | null = null;
  parser.on("error", (err) => {
    parseFailed = true;
    // busboy goes on emitting parts after an error (a malformed header, then the file), but the body is unpiped
    // from it above, so a file part it had begun never ends: its reader would wait for ever (found by the fuzz
    // campaign as uploads left unanswered). The error ends that stream too, as the request's 400.
    if (captureOut && !captureOut.writableEnded) captureOut.destroy(malformed(err));
  });

  const file = new Promise<{ stream: Readable; filename: string; mimeType: string }>((resolve, reject) => {
    parser.on("file", (name, stream, info) => {
      // busboy also raises a body's breaking off (e.g. "Unexpected end of form") on the file stream it is in:
      // a stream only drained here needs a listener too, or that error is uncaught in the server. The parser's
      // own error already answers the request with a 400.
      if (name !== fileField || fileSeen || parseFailed) {
        stream.on("error", () => undefined);
        stream.resume();
        return;
      }
      fileSeen = true;
      const filename = info.filename ?? "capture.csv";
      const badName = filenameProblem(filename);
      if (badName) {
        stream.on("error", () => undefined);
        stream.resume();
        reject(new BadRequestError(badName, { [fileField]: [badName] }));
        return;
      }
      // The body can break off before the caller starts reading (it checks the build first): the failure is
      // kept on the stream it gets, as a 400, instead of surfacing as an uncaught error on busboy's stream.
      const out = new PassThrough();
      out.on("error", () => undefined);
      stream.on("error", (err) => out.destroy(malformed(err)));
      captureOut = out;
      stream.pipe(out);
      resolve({ stream: out, filename, mimeType: info.mimeType ?? "" });
    });
    parser.on("close", () => {
      if (!fileSeen && !parseFailed) reject(new BadRequestError(`No file in the field “${fileField}”.`, { [fileField]: ["missing"] }));
    });
    parser.on("error", failAfterDrain(reject));
  });
  const done = new Promise<Record<string, string>>((resolve, reject) => {
    let nulField: string | null = null;
    parser.on("field", (name, value) => {
      // PostgreSQL text cannot hold a NUL character; refused here rather than failing the insert with a 500.
      // busboy hands a part without a name="…" parameter over with name undefined (found by the fuzz campaign).
      if ((value ?? "").includes("\u0000") || (name ?? "").includes("\u0000")) nulField ??= name ?? "";
      fields[name] = value;
    });
    parser.on("close", () => {
      if (parseFailed) return;
      if (nulField === null) resolve(fields);
      else reject(new BadRequestError(`Text cannot contain the NUL character (U+0000); the field “${nulField}” has one.`, { [nulField]: ["contains U+0000"] }));
    });
    parser.on("error", failAfterDrain(reject));
  });
  // Either promise may go unawaited when the other fails first; their rejections are handled by the caller's.
  file.catch(() => undefined);
  done.catch(() => undefined);
  body.pipe(parser);
  return { file, fields: done };
}

/**
 * Waits (at most `limitMs`) until the whole request body has been read, so a refusal made while the file was
 * still arriving is answered after the client finished sending, not by resetting its connection.
 */
export async function bodyRead(parts: MultipartCapture, limitMs = 2_000): Promise<void> {
  let timer: NodeJS.Timeout | undefined;
  await Promise.race([
    parts.fields.then(
      () => undefined,
      () => undefined,
    ),
    new Promise<void>((resolve) => {
      timer = setTimeout(resolve, limitMs);
    }),
  ]);
  clearTimeout(timer);
}
