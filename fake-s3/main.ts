import { parseArgs } from "node:util";
import { startFakeS3 } from "./server";

// Usage: npx tsx fake-s3/main.ts --port 4569 --dir .data/s3 --bucket tankbook-captures --origin http://127.0.0.1:3000
const { values } = parseArgs({
  options: {
    host: { type: "string", default: "127.0.0.1" },
    port: { type: "string", default: "4569" },
    dir: { type: "string", default: ".data/s3" },
    bucket: { type: "string", multiple: true },
    origin: { type: "string", multiple: true },
  },
  strict: true,
});

const port = Number(values.port);
if (!Number.isInteger(port) || port < 0 || port > 65535) {
  console.error(`fake S3: --port must be an integer 0..65535, got "${values.port}"`);
  process.exit(2);
}
const buckets = values.bucket ?? ["tankbook-captures"];
const origins = values.origin ?? ["http://127.0.0.1:3000", "http://localhost:3000"];

const server = await startFakeS3({ host: values.host, port, directory: values.dir, buckets, allowedOrigins: origins });
console.log(`fake S3 listening on ${server.endpoint} (buckets: ${buckets.join(", ")})`);

let stopping = false;
async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  try {
    await server.close();
    process.exit(0);
  } catch (err) {
    console.error(`fake S3: error while stopping on ${signal}:`, err);
    process.exit(1);
  }
}
process.on("SIGINT", () => void stop("SIGINT"));
process.on("SIGTERM", () => void stop("SIGTERM"));
