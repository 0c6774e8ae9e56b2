import { Readable } from "node:stream";
import {
  CreateBucketCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
} from "@aws-sdk/client-s3";
import { Upload } from "@aws-sdk/lib-storage";
import { getSignedUrl } from "@aws-sdk/s3-request-presigner";
import { env, type Env } from "../env";
import { bucketKeys } from "./bucket-keys";
import { StorageError, toStorageError } from "./errors";

/** Largest expiry S3 accepts for a presigned URL (7 days). */
const MAX_PRESIGN_SECONDS = 7 * 24 * 3600;
const HEALTH_TIMEOUT_MS = 2_000;
/** Multipart part size for streamed uploads; S3's minimum is 5 MiB. */
const UPLOAD_PART_BYTES = 8 * 1024 * 1024;

interface Storage {
  client: S3Client;
  bucket: string;
  /** For error messages: the configured endpoint, or the AWS regional one. */
  endpoint: string;
}

// The client is made on first use from the environment as it is then, and remade whenever the S3 settings
// change, so tests and scripts can point process.env at their own server before the first call
// (nothing reads the environment at import time).
let current: { key: string; storage: Storage } | undefined;

function storage(): Storage {
  const e: Env = env();
  const key = JSON.stringify([e.S3_ENDPOINT, e.S3_REGION, e.S3_BUCKET, e.S3_ACCESS_KEY_ID, e.S3_SECRET_ACCESS_KEY, e.S3_FORCE_PATH_STYLE]);
  if (current?.key === key) return current.storage;
  current?.storage.client.destroy();
  const client = new S3Client({
    region: e.S3_REGION,
    // Only set for an emulator or another S3-compatible service; empty means real AWS S3.
    endpoint: e.S3_ENDPOINT || undefined,
    forcePathStyle: e.S3_FORCE_PATH_STYLE,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
    // Default checksums would add x-amz-checksum-* query params to presigned URLs that a browser PUT
    // of a different body cannot satisfy (STACK-NOTES §8).
    requestChecksumCalculation: "WHEN_REQUIRED",
    responseChecksumValidation: "WHEN_REQUIRED",
    requestHandler: { connectionTimeout: 5_000 },
  });
  const storageNow = {
    client,
    bucket: e.S3_BUCKET,
    endpoint: e.S3_ENDPOINT || `https://s3.${e.S3_REGION}.amazonaws.com`,
  };
  current = { key, storage: storageNow };
  return storageNow;
}

async function run<T>(action: string, call: (s: Storage) => Promise<T>): Promise<T> {
  const s = storage();
  try {
    return await call(s);
  } catch (err) {
    throw toStorageError(err, action, s);
  }
}

function checkExpiry(expiresInSeconds: number): void {
  if (!Number.isInteger(expiresInSeconds) || expiresInSeconds < 1 || expiresInSeconds > MAX_PRESIGN_SECONDS) {
    throw new RangeError(`expiresInSeconds must be an integer 1..${MAX_PRESIGN_SECONDS}; got ${expiresInSeconds}`);
  }
}

function isNotFound(err: unknown): boolean {
  return err instanceof StorageError && err.kind === "not-found";
}

/**
 * Every key in the configured bucket (S3_BUCKET), all pages: for the checks that a refused request
 * stored nothing (the fuzz campaign, the hostile tests).
 * @throws StorageError when storage is unreachable or the bucket is missing
 */
export async function listObjectKeys(): Promise<string[]> {
  return run("list the bucket", ({ client, bucket }) => bucketKeys(client, bucket));
}

/** Closes the storage client (made again on the next call), so a script's or test file's process can end. */
export function closeStorage(): void {
  current?.storage.client.destroy();
  current = undefined;
}

/**
 * Create the configured bucket (S3_BUCKET) when it does not exist yet.
 * @throws StorageError when storage is unreachable or refuses
 */
export async function ensureBucket(): Promise<void> {
  await run(`create bucket`, async ({ client, bucket }) => {
    try {
      await client.send(new HeadBucketCommand({ Bucket: bucket }));
      return;
    } catch (err) {
      const name = err instanceof Error ? err.name : "";
      const status = (err as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
      if (name !== "NotFound" && name !== "NoSuchBucket" && status !== 404) throw err;
    }
    try {
      await client.send(new CreateBucketCommand({ Bucket: bucket }));
    } catch (err) {
      // Another process may have created it between the two calls.
      if (!(err instanceof Error && err.name === "BucketAlreadyOwnedByYou")) throw err;
    }
  });
}

/**
 * Store an object. Buffers go up in one PUT; streams go up in 8 MiB multipart parts, so a large body
 * never sits in memory whole.
 * @param key object key from {@link captureObjectKey} / {@link photoObjectKey}
 * @param contentType stored as the object's Content-Type; defaults to application/octet-stream
 * @returns the ETag S3 gave the object (quotes removed)
 * @throws StorageError
 */
export async function putObject(
  key: string,
  body: Buffer | Uint8Array | Readable,
  contentType = "application/octet-stream",
): Promise<{ etag: string | undefined }> {
  return run(`put "${key}"`, async ({ client, bucket }) => {
    if (body instanceof Readable) {
      const upload = new Upload({
        client,
        params: { Bucket: bucket, Key: key, Body: body, ContentType: contentType },
        partSize: UPLOAD_PART_BYTES,
        queueSize: 2,
        leavePartsOnError: false,
      });
      const result = await upload.done();
      return { etag: result.ETag?.replace(/"/g, "") };
    }
    const result = await client.send(
      new PutObjectCommand({ Bucket: bucket, Key: key, Body: body, ContentType: contentType, ContentLength: body.byteLength }),
    );
    return { etag: result.ETag?.replace(/"/g, "") };
  });
}

/**
 * Read an object as a Node stream (the caller must consume or destroy it).
 * @throws StorageError (kind "not-found" when the key does not exist)
 */
export async function getObjectStream(key: string): Promise<Readable> {
  return run(`get "${key}"`, async ({ client, bucket }) => {
    const result = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
    if (!(result.Body instanceof Readable)) throw new StorageError("failed", `get "${key}" returned no readable body`);
    return result.Body;
  });
}

/**
 * Read a whole object into memory; for small objects only (use {@link getObjectStream} for captures).
 * @throws StorageError (kind "not-found" when the key does not exist)
 */
export async function getObjectBuffer(key: string): Promise<Buffer> {
  return run(`get "${key}"`, async ({ client, bucket }) => {
    const result = await client.send(new GetObjectCommand({ Bucket: bucket, Key: key }));
    if (!result.Body) throw new StorageError("failed", `get "${key}" returned no body`);
    return Buffer.from(await result.Body.transformToByteArray());
  });
}

/** What S3 knows about a stored object. */
export interface ObjectInfo {
  sizeBytes: number;
  contentType: string | undefined;
  /** ETag without its quotes. */
  etag: string | undefined;
}

/**
 * Size, type and ETag of an object.
 * @returns null when the object does not exist
 * @throws StorageError for every other failure
 */
export async function headObject(key: string): Promise<ObjectInfo | null> {
  try {
    return await run(`head "${key}"`, async ({ client, bucket }) => {
      const result = await client.send(new HeadObjectCommand({ Bucket: bucket, Key: key }));
      return { sizeBytes: result.ContentLength ?? 0, contentType: result.ContentType, etag: result.ETag?.replace(/"/g, "") };
    });
  } catch (err) {
    if (isNotFound(err)) return null;
    throw err;
  }
}

/**
 * Delete an object; deleting a missing key is not an error (S3 semantics).
 * @throws StorageError
 */
export async function deleteObject(key: string): Promise<void> {
  await run(`delete "${key}"`, ({ client, bucket }) => client.send(new DeleteObjectCommand({ Bucket: bucket, Key: key })));
}

/** Options for {@link presignPut}. */
export interface PresignPutOptions {
  /** Content-Type the uploader should send; S3 stores whatever the PUT carries. */
  contentType: string;
  /** 1 s to 7 days. */
  expiresInSeconds: number;
  /**
   * Exact body size in bytes. When given it is signed into the URL as Content-Length, so real S3 rejects a
   * body of any other size (the fake S3 does not check signatures). A presigned PUT cannot carry a range,
   * so in every case confirm the stored size with headObject after the upload.
   */
  sizeBytes?: number;
  /** Ceiling for sizeBytes; defaults to UPLOAD_LIMIT_BYTES. */
  maxBytes?: number;
}

/**
 * A URL a browser can PUT the object to directly (bucket CORS must allow the page's origin).
 * @returns the presigned URL
 * @throws RangeError for a bad expiry or a sizeBytes over maxBytes
 */
export async function presignPut(key: string, options: PresignPutOptions): Promise<string> {
  checkExpiry(options.expiresInSeconds);
  const maxBytes = options.maxBytes ?? env().UPLOAD_LIMIT_BYTES;
  if (options.sizeBytes !== undefined) {
    if (!Number.isInteger(options.sizeBytes) || options.sizeBytes < 0 || options.sizeBytes > maxBytes) {
      throw new RangeError(`sizeBytes must be an integer 0..${maxBytes} (the upload limit); got ${options.sizeBytes}`);
    }
  }
  return run(`presign put "${key}"`, ({ client, bucket }) =>
    getSignedUrl(
      client,
      new PutObjectCommand({ Bucket: bucket, Key: key, ContentType: options.contentType, ContentLength: options.sizeBytes }),
      { expiresIn: options.expiresInSeconds },
    ),
  );
}

function contentDisposition(filename: string): string {
  // Quoted ASCII fallback for old clients plus the RFC 5987 UTF-8 form for everyone else.
  const ascii = filename.replace(/[^\x20-\x7e]|["\\]/g, "_");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeURIComponent(filename)}`;
}

/**
 * A URL that downloads the object as an attachment named `filename`.
 * @param filename shown to the user only; never used as a key
 * @throws RangeError for a bad expiry
 */
export async function presignGet(key: string, options: { filename: string; expiresInSeconds: number }): Promise<string> {
  checkExpiry(options.expiresInSeconds);
  return run(`presign get "${key}"`, ({ client, bucket }) =>
    getSignedUrl(
      client,
      new GetObjectCommand({ Bucket: bucket, Key: key, ResponseContentDisposition: contentDisposition(options.filename) }),
      { expiresIn: options.expiresInSeconds },
    ),
  );
}

/**
 * For /api/health: can we reach the bucket within ~2 s?
 * @returns `{ ok: true }` or `{ ok: false, error }` with a readable reason; never throws
 */
export async function checkStorage(): Promise<{ ok: true } | { ok: false; error: string }> {
  try {
    await run("health check", ({ client, bucket }) =>
      client.send(new HeadBucketCommand({ Bucket: bucket }), { abortSignal: AbortSignal.timeout(HEALTH_TIMEOUT_MS) }),
    );
    return { ok: true };
  } catch (err) {
    if (err instanceof StorageError && err.kind === "not-found") {
      // HeadBucket's 404 carries no body, so it arrives as a plain NotFound.
      const s = storage();
      return { ok: false, error: `Bucket "${s.bucket}" does not exist at ${s.endpoint}` };
    }
    return { ok: false, error: err instanceof Error ? err.message : String(err) };
  }
}
