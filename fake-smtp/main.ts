import { parseArgs } from "node:util";
import { startFakeSmtp } from "./server";

// Usage: npx tsx fake-smtp/main.ts --smtp-port 2525 --api-port 2526 --dir .data/smtp
const { values } = parseArgs({
  options: {
    host: { type: "string", default: "127.0.0.1" },
    "smtp-port": { type: "string", default: "2525" },
    "api-port": { type: "string", default: "2526" },
    dir: { type: "string", default: ".data/smtp" },
  },
  strict: true,
});

function portArg(name: string, raw: string): number {
  const port = Number(raw);
  if (!Number.isInteger(port) || port < 0 || port > 65535) {
    console.error(`fake SMTP: --${name} must be an integer 0..65535, got "${raw}"`);
    process.exit(2);
  }
  return port;
}

const server = await startFakeSmtp({
  host: values.host,
  smtpPort: portArg("smtp-port", values["smtp-port"]),
  apiPort: portArg("api-port", values["api-port"]),
  directory: values.dir,
});
console.log(
  `fake SMTP listening on smtp://${server.smtpHost}:${server.smtpPort}, messages at ${server.apiUrl}/messages (kept in ${values.dir})`,
);

let stopping = false;
async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  try {
    await server.close();
    process.exit(0);
  } catch (err) {
    console.error(`fake SMTP: error while stopping on ${signal}:`, err);
    process.exit(1);
  }
}
process.on("SIGINT", () => void stop("SIGINT"));
process.on("SIGTERM", () => void stop("SIGTERM"));
