import { ListObjectsCommand, type S3Client } from "@aws-sdk/client-s3";

/**
 * All keys of `bucket`, page by page. ListObjects (version 1, paged by Marker) rather than ListObjectsV2: the
 * fake S3 (s3rver 3) makes V2's continuation token with the DES cipher, which the OpenSSL 3 of Node 20 no longer
 * offers, so any V2 listing with more than one page (over 1,000 objects) failed with InternalError.
 * @throws the S3 client's own error (e.g. NoSuchBucket): a missing bucket is not an empty one
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
