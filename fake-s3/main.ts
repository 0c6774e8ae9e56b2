import { parseArgs } from "node:util";
import { portArgument, stopOnSignals } from "../scripts/lib/service-cli";
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

const port = portArgument("fake S3", "port", values.port);
const buckets = values.bucket ?? ["tankbook-captures"];
const origins = values.origin ?? ["http://127.0.0.1:3000", "http://localhost:3000"];

const server = await startFakeS3({ host: values.host, port, directory: values.dir, buckets, allowedOrigins: origins });
console.log(`fake S3 listening on ${server.endpoint} (buckets: ${buckets.join(", ")})`);

stopOnSignals("fake S3", server);
