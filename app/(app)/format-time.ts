import { formatDateTime } from "@/lib/format/dates";
import { DASH } from "@/lib/format/numbers";

/** "2026-12-01 23:14 UTC": one unambiguous form for every time on the account pages. */
export function formatUtc(date: Date | string | null): string {
  const text = formatDateTime(date, { timeZone: "UTC" });
  return text === DASH ? text : `${text} UTC`;
}
