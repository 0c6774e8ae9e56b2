import { mkdir } from "node:fs/promises";
import S3rver from "s3rver";

/** Options for {@link startFakeS3}. */
export interface FakeS3Options {
  /** Interface to listen on; loopback by default so the emulator is never reachable from the network. */
  host?: string;
  /** TCP port; 0 picks a free ephemeral port (tests do this). */
  port: number;
  /** Folder where s3rver keeps buckets and objects; kept across restarts. */
  directory: string;
  /** Buckets created on start (existing ones and their objects are kept). */
  buckets: string[];
  /** Page origins allowed to PUT/GET through presigned URLs, e.g. "http://127.0.0.1:3000". */
  allowedOrigins: string[];
}

/** A running fake S3. */
export interface FakeS3 {
  /** Base URL to use as S3_ENDPOINT, e.g. "http://127.0.0.1:4569". */
  endpoint: string;
  close(): Promise<void>;
}

function xmlEscape(value: string): string {
  return value.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
}

/**
 * The bucket CORS rules: browsers on the app's own pages may PUT (upload) and GET/HEAD (download) through
 * presigned URLs, and may read ETag so an upload form can confirm what S3 stored.
 */
export function corsConfigurationXml(allowedOrigins: string[]): string {
  const origins = allowedOrigins.map((o) => `    <AllowedOrigin>${xmlEscape(o)}</AllowedOrigin>`).join("\n");
  return `<?xml version="1.0" encoding="UTF-8"?>
<CORSConfiguration xmlns="http://s3.amazonaws.com/doc/2006-03-01/">
  <CORSRule>
${origins}
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <MaxAgeSeconds>600</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;
}

/**
 * Start an S3-compatible emulator (s3rver) that persists to `directory`.
 *
 * @returns the endpoint URL and a `close()` that stops accepting connections and waits for the server to shut.
 * @throws TypeError when `allowedOrigins` or `buckets` is empty; the listen error (e.g. EADDRINUSE) as is.
 */
export async function startFakeS3(options: FakeS3Options): Promise<FakeS3> {
  const host = options.host ?? "127.0.0.1";
  if (options.buckets.length === 0) throw new TypeError("startFakeS3: buckets must name at least one bucket");
  if (options.allowedOrigins.length === 0) {
    throw new TypeError("startFakeS3: allowedOrigins must name at least one origin, or browsers cannot upload");
  }
  await mkdir(options.directory, { recursive: true });
  const cors = corsConfigurationXml(options.allowedOrigins);
  const server = new S3rver({
    address: host,
    port: options.port,
    silent: true,
    directory: options.directory,
    resetOnClose: false,
    // Path-style only: virtual-host buckets would need wildcard DNS for *.127.0.0.1.
    vhostBuckets: false,
    configureBuckets: options.buckets.map((name) => ({ name, configs: [cors] })),
  });
  const address = await server.run();
  const endpointHost = address.family === "IPv6" ? `[${address.address}]` : address.address;
  return {
    endpoint: `http://${endpointHost}:${address.port}`,
    close: () => server.close(),
  };
}
