import { env } from "../env";
import type { HeldMessage } from "./held-message";

// Reads the development fake SMTP server's HTTP API (FAKE_SMTP_API_URL). For tests and the dev outbox page only.

function apiUrl(): string {
  const base = env().FAKE_SMTP_API_URL;
  if (!base) {
    throw new Error("The outbox is only available with the development fake SMTP server: FAKE_SMTP_API_URL is empty");
  }
  return base.replace(/\/+$/, "");
}

async function call(path: string, init?: RequestInit): Promise<Response> {
  const base = apiUrl();
  let res: Response;
  try {
    res = await fetch(`${base}${path}`, { ...init, signal: AbortSignal.timeout(5_000) });
  } catch (err) {
    throw new Error(`The fake SMTP server's API is unreachable at ${base}: ${err instanceof Error ? err.message : String(err)}`, { cause: err });
  }
  if (!res.ok && res.status !== 404) {
    throw new Error(`The fake SMTP server's API at ${base} answered ${res.status} to ${init?.method ?? "GET"} ${path}`);
  }
  return res;
}

/**
 * Messages the fake SMTP server holds, newest first.
 * @param filter.to only messages whose envelope recipients include this address (case-insensitive)
 * @throws Error when FAKE_SMTP_API_URL is empty or the API is unreachable
 */
export async function listHeldMessages(filter: { to?: string } = {}): Promise<HeldMessage[]> {
  const query = filter.to ? `?to=${encodeURIComponent(filter.to)}` : "";
  const res = await call(`/messages${query}`);
  const body = (await res.json()) as { messages: HeldMessage[] };
  return body.messages;
}

/**
 * One held message by id.
 * @returns null when no message has that id
 * @throws Error when FAKE_SMTP_API_URL is empty or the API is unreachable
 */
export async function getHeldMessage(id: string): Promise<HeldMessage | null> {
  const res = await call(`/messages/${encodeURIComponent(id)}`);
  if (res.status === 404) return null;
  return (await res.json()) as HeldMessage;
}

/**
 * Forget every held message (tests call this to start clean).
 * @throws Error when FAKE_SMTP_API_URL is empty or the API is unreachable
 */
export async function clearHeldMessages(): Promise<void> {
  await call("/messages", { method: "DELETE" });
}
