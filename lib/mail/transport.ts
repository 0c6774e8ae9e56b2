import nodemailer, { type Transporter } from "nodemailer";
import { env, type Env } from "../env";

/** Timeouts for ordinary sending, in milliseconds; nodemailer's defaults would wait minutes. */
const SEND_TIMEOUTS = { connectionTimeout: 10_000, greetingTimeout: 10_000, socketTimeout: 30_000 };

/** Human label for the configured server, used in error messages, e.g. "smtp://127.0.0.1:2525". */
export function mailServerLabel(e: Env = env()): string {
  return `${e.SMTP_SECURE ? "smtps" : "smtp"}://${e.SMTP_HOST}:${e.SMTP_PORT}`;
}

/**
 * A fresh nodemailer transport for the given settings.
 * @param timeoutMs when given, one short limit for connect, greeting and idle socket (for health checks)
 */
export function createMailTransport(e: Env = env(), timeoutMs?: number): Transporter {
  const timeouts = timeoutMs === undefined ? SEND_TIMEOUTS : { connectionTimeout: timeoutMs, greetingTimeout: timeoutMs, socketTimeout: timeoutMs };
  return nodemailer.createTransport({
    host: e.SMTP_HOST,
    port: e.SMTP_PORT,
    // secure=true is implicit TLS (port 465); otherwise nodemailer upgrades with STARTTLS when the server offers it.
    secure: e.SMTP_SECURE,
    auth: e.SMTP_USER ? { user: e.SMTP_USER, pass: e.SMTP_PASSWORD ?? "" } : undefined,
    ...timeouts,
  });
}

// Made on first use and remade when the SMTP settings change, so tests and scripts can point process.env
// at their own server before the first send (nothing reads the environment at import time).
let current: { key: string; transport: Transporter } | undefined;

/** The shared transport for the current environment. */
export function mailTransport(): Transporter {
  const e = env();
  const key = JSON.stringify([e.SMTP_HOST, e.SMTP_PORT, e.SMTP_SECURE, e.SMTP_USER, e.SMTP_PASSWORD]);
  if (current?.key === key) return current.transport;
  current?.transport.close();
  current = { key, transport: createMailTransport(e) };
  return current.transport;
}
