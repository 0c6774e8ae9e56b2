import { z } from "zod";

/**
 * Every setting Tankbook reads from the environment, validated once.
 * The defaults are the single-machine development stack that `npm start` brings up on loopback;
 * `npm test` overrides them with its own ports, database and bucket (see scripts/bootstrap.mjs).
 */
const envSchema = z.object({
  NODE_ENV: z.enum(["development", "production", "test"]).default("development"),
  APP_URL: z.url().default("http://127.0.0.1:3000"),
  DATABASE_URL: z.string().min(1).default("postgres://postgres@127.0.0.1:54329/tankbook"),
  S3_ENDPOINT: z.string().default("http://127.0.0.1:4569"),
  S3_REGION: z.string().min(1).default("us-east-1"),
  S3_BUCKET: z.string().min(3).default("tankbook-captures"),
  S3_ACCESS_KEY_ID: z.string().min(1).default("S3RVER"),
  S3_SECRET_ACCESS_KEY: z.string().min(1).default("S3RVER"),
  S3_FORCE_PATH_STYLE: z.enum(["true", "false"]).default("true").transform((v) => v === "true"),
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().positive().default(2525),
  SMTP_SECURE: z.enum(["true", "false"]).default("false").transform((v) => v === "true"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default("Tankbook <no-reply@tankbook.test>"),
  /** HTTP side of the development fake SMTP server, where its held messages can be read. Empty in production. */
  FAKE_SMTP_API_URL: z.string().default("http://127.0.0.1:2526"),
  UPLOAD_LIMIT_BYTES: z.coerce.number().int().positive().default(500_000_000),
  /** Writes (POST, PUT, PATCH, DELETE) one user may make through /api/v1 per minute; more get 429. */
  API_WRITES_PER_MINUTE: z.coerce.number().int().positive().default(600),
});

export type Env = z.infer<typeof envSchema>;

let cached: Env | undefined;

/** The validated environment; throws one readable line per bad variable. */
export function env(): Env {
  if (cached) return cached;
  const parsed = envSchema.safeParse(process.env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    throw new Error(`Bad environment:\n${lines.join("\n")}`);
  }
  cached = parsed.data;
  return cached;
}
