// Where the web benchmark's own stack lives: ports and names apart from `npm start` (3000) and `npm test` (3100),
// so it can run beside both. Importing this module points process.env at that stack, so it must be the first
// import of the entry script (the seed code it runs reads DATABASE_URL, S3_* and SMTP_* on first use).
import path from "node:path";
import { fileURLToPath } from "node:url";

export const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), "../../..");

export const bench = {
  appPort: 3400,
  pgPort: 54340,
  database: "tankbook_bench",
  s3Port: 4600,
  bucket: "tankbook-bench",
  smtpPort: 2600,
  smtpApiPort: 2601,
  /** Everything the bench writes besides the PostgreSQL cluster (fake S3 objects, fake SMTP messages). */
  dataDir: path.join(root, ".data", "bench"),
  // Its own production build beside .next and .next-test (the .gitignore pattern for .next-* folders covers it).
  distDir: ".next-bench",
} as const;

export const appUrl = `http://127.0.0.1:${bench.appPort}`;

/** The environment of every process of the bench stack (app, worker, fake services) and of this one. */
export const benchEnv: Record<string, string> = {
  APP_URL: appUrl,
  DATABASE_URL: `postgres://postgres@127.0.0.1:${bench.pgPort}/${bench.database}`,
  S3_ENDPOINT: `http://127.0.0.1:${bench.s3Port}`,
  S3_BUCKET: bench.bucket,
  SMTP_HOST: "127.0.0.1",
  SMTP_PORT: String(bench.smtpPort),
  FAKE_SMTP_API_URL: `http://127.0.0.1:${bench.smtpApiPort}`,
  NEXT_TELEMETRY_DISABLED: "1",
  NEXT_DIST_DIR: bench.distDir,
  NODE_OPTIONS: [process.env.NODE_OPTIONS, "--disable-warning=NodeVersionSupportWarning"].filter(Boolean).join(" "),
};

Object.assign(process.env, benchEnv);
