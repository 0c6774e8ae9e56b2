import { env } from "@/lib/env";

/**
 * Whether the outbox page exists: only when the app sends through the development fake SMTP server, whose
 * HTTP API (FAKE_SMTP_API_URL) holds every message. `npm start` runs `next start`, so NODE_ENV cannot tell.
 */
export function outboxAvailable(): boolean {
  return env().FAKE_SMTP_API_URL.trim() !== "";
}
