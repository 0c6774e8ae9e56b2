import { parseArgs } from "node:util";
import { portArgument, stopOnSignals } from "../scripts/lib/service-cli";
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

const server = await startFakeSmtp({
  host: values.host,
  smtpPort: portArgument("fake SMTP", "smtp-port", values["smtp-port"]),
  apiPort: portArgument("fake SMTP", "api-port", values["api-port"]),
  directory: values.dir,
});
console.log(
  `fake SMTP listening on smtp://${server.smtpHost}:${server.smtpPort}, messages at ${server.apiUrl}/messages (kept in ${values.dir})`,
);

stopOnSignals("fake SMTP", server);
