import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { startFakeS3, type FakeS3 } from "../../fake-s3/server";
import { bucketKeys } from "@/lib/storage/bucket-keys";

// The storage checks of the fuzz campaign and the hostile tests list the whole bucket. The fake S3 could not page
// a ListObjectsV2 listing on Node 20 (its continuation token needs the DES cipher OpenSSL 3 dropped): the full
// campaign's end-of-run listing of 1,131 objects failed every time. This fills a bucket of its own past one page.

const BUCKET = "tankbook-keys";
const OBJECTS = 1_150;
const storedKeys = Array.from({ length: OBJECTS }, (_, i) => `captures/2026/12/run-${String(i).padStart(5, "0")}-${(i * 7919) % 1000}.csv`);
let dir: string;
let s3: FakeS3;
let client: S3Client;

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tankbook-keys-"));
  s3 = await startFakeS3({ port: 0, directory: dir, buckets: [BUCKET], allowedOrigins: ["http://127.0.0.1:3000"] });
  client = new S3Client({ region: "us-east-1", endpoint: s3.endpoint, forcePathStyle: true, credentials: { accessKeyId: "S3RVER", secretAccessKey: "S3RVER" } });
  const keys = storedKeys;
  for (let i = 0; i < keys.length; i += 50) {
    await Promise.all(keys.slice(i, i + 50).map((Key) => client.send(new PutObjectCommand({ Bucket: BUCKET, Key, Body: "t,v\n0,1\n" }))));
  }
}, 120_000);

afterAll(async () => {
  client?.destroy();
  await s3?.close().catch(() => undefined);
  if (dir) await rm(dir, { recursive: true, force: true });
});

describe("bucketKeys", () => {
  it("lists every key of a bucket with more than one page (1,000 keys a page), each once", async () => {
    const keys = await bucketKeys(client, BUCKET);
    expect(keys.length).toBe(OBJECTS);
    expect(new Set(keys).size).toBe(OBJECTS);
    expect([...keys].sort()).toEqual([...storedKeys].sort());
  }, 60_000);

  // A bucket that is not there must not count as an empty one, or a check that nothing was stored would pass.
  it("throws for a bucket that does not exist instead of answering no keys", async () => {
    await expect(bucketKeys(client, "tankbook-keys-empty").catch((e: Error) => e.name)).resolves.toBe("NoSuchBucket");
  });
});
