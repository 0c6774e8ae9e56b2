// Every key in a bucket, for the checks that a refusal stored nothing (the fuzz campaign, the hostile tests).
import { ListObjectsCommand, S3Client } from "@aws-sdk/client-s3";
import { env } from "../../lib/env";

/**
 * All keys of `bucket`, page by page. ListObjects (version 1, paged by Marker) rather than ListObjectsV2: the
 * fake S3 (s3rver 3) makes V2's continuation token with the DES cipher, which the OpenSSL 3 of Node 20 no longer
 * offers, so any V2 listing with more than one page (over 1,000 objects) failed with InternalError.
 */
export async function bucketKeys(client: S3Client, bucket: string): Promise<string[]> {
  const keys: string[] = [];
  let marker: string | undefined;
  for (;;) {
    const page = await client.send(new ListObjectsCommand({ Bucket: bucket, Marker: marker }));
    for (const o of page.Contents ?? []) if (o.Key) keys.push(o.Key);
    if (!page.IsTruncated || keys.length === 0) return keys;
    const next = page.NextMarker ?? keys[keys.length - 1];
    if (next === marker) return keys;
    marker = next;
  }
}

let appClient: S3Client | undefined;

/** Every key in the app's own bucket (S3_BUCKET), through one client made from the app's S3 settings. */
export function appBucketKeys(): Promise<string[]> {
  const e = env();
  appClient ??= new S3Client({
    region: e.S3_REGION,
    endpoint: e.S3_ENDPOINT || undefined,
    forcePathStyle: e.S3_FORCE_PATH_STYLE,
    credentials: { accessKeyId: e.S3_ACCESS_KEY_ID, secretAccessKey: e.S3_SECRET_ACCESS_KEY },
  });
  return bucketKeys(appClient, e.S3_BUCKET);
}

/** Closes the client {@link appBucketKeys} made, so a test file's process can end. */
export function closeAppBucketClient(): void {
  appClient?.destroy();
  appClient = undefined;
}
