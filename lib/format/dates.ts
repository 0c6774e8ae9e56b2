/**
 * Dates and times on screen: one fixed, sortable form everywhere (2026-12-01 14:32), in the viewer's local time
 * zone, so a bench log reads the same on every machine's locale.
 */
import { DASH } from "./numbers";

function pad(n: number): string {
  return String(n).padStart(2, "0");
}

function toDate(value: Date | string | number | null | undefined): Date | undefined {
  if (value === null || value === undefined) return undefined;
  const date = value instanceof Date ? value : new Date(value);
  return Number.isNaN(date.getTime()) ? undefined : date;
}

/**
 * @param value - a Date, an ISO string or epoch milliseconds.
 * @param options.seconds - include seconds; default false.
 * @param options.timeZone - "local" (default) or "UTC" (for tests and server renders that must not depend on the host).
 * @returns e.g. "2026-12-01 14:32"; invalid or missing → "—".
 */
export function formatDateTime(
  value: Date | string | number | null | undefined,
  options: { seconds?: boolean; timeZone?: "local" | "UTC" } = {},
): string {
  const d = toDate(value);
  if (!d) return DASH;
  const utc = options.timeZone === "UTC";
  const y = utc ? d.getUTCFullYear() : d.getFullYear();
  const mo = (utc ? d.getUTCMonth() : d.getMonth()) + 1;
  const day = utc ? d.getUTCDate() : d.getDate();
  const h = utc ? d.getUTCHours() : d.getHours();
  const mi = utc ? d.getUTCMinutes() : d.getMinutes();
  const s = utc ? d.getUTCSeconds() : d.getSeconds();
  const time = options.seconds ? `${pad(h)}:${pad(mi)}:${pad(s)}` : `${pad(h)}:${pad(mi)}`;
  return `${y}-${pad(mo)}-${pad(day)} ${time}`;
}

/** The date alone, same rules as {@link formatDateTime}: "2026-12-01". */
export function formatDate(
  value: Date | string | number | null | undefined,
  options: { timeZone?: "local" | "UTC" } = {},
): string {
  const text = formatDateTime(value, options);
  return text === DASH ? text : text.slice(0, 10);
}
