/** "2026-12-01 23:14 UTC": one unambiguous form for every time on the account pages. */
export function formatUtc(date: Date | string | null): string {
  if (!date) return "—";
  const d = typeof date === "string" ? new Date(date) : date;
  return `${d.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}
