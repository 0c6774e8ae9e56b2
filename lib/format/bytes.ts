/**
 * Sizes, transfer rates and durations for the upload form and the run metadata. Decimal (SI) megabytes, as
 * file managers and upload dialogs on most systems show them.
 */
import { DASH } from "./numbers";

const UNITS = ["B", "kB", "MB", "GB", "TB"] as const;

/**
 * A byte count in B, kB, MB, GB.
 *
 * @param bytes - count, 0 or above.
 * @returns e.g. 0 → "0 B"; 1234 → "1.23 kB"; 734003200 → "734 MB".
 */
export function formatBytes(bytes: number | null | undefined): string {
  if (typeof bytes !== "number" || !Number.isFinite(bytes) || bytes < 0) return DASH;
  if (bytes < 1000) return `${Math.round(bytes)} B`;
  let value = bytes;
  let unit = 0;
  while (value >= 1000 && unit < UNITS.length - 1) {
    value /= 1000;
    unit += 1;
  }
  // Keep three significant figures without trailing ".0" noise on big values.
  const text = value >= 100 ? value.toFixed(0) : value >= 10 ? value.toFixed(1) : value.toFixed(2);
  return `${text} ${UNITS[unit]}`;
}

/**
 * A transfer rate in MB/s.
 *
 * @param bytesPerSecond - rate, 0 or above.
 * @returns e.g. 12_345_678 → "12.3 MB/s"; 250_000 → "0.25 MB/s".
 */
export function formatRate(bytesPerSecond: number | null | undefined): string {
  if (typeof bytesPerSecond !== "number" || !Number.isFinite(bytesPerSecond) || bytesPerSecond < 0) return DASH;
  const mb = bytesPerSecond / 1e6;
  const text = mb >= 100 ? mb.toFixed(0) : mb >= 10 ? mb.toFixed(1) : mb.toFixed(2);
  return `${text} MB/s`;
}

/**
 * A short duration for "time left" and capture lengths.
 *
 * @param seconds - 0 or above.
 * @returns e.g. 4.2 → "4 s"; 75 → "1 min 15 s"; 3725 → "1 h 2 min".
 */
export function formatDuration(seconds: number | null | undefined): string {
  if (typeof seconds !== "number" || !Number.isFinite(seconds) || seconds < 0) return DASH;
  const s = Math.round(seconds);
  if (s < 60) return `${s} s`;
  if (s < 3600) return `${Math.floor(s / 60)} min ${s % 60} s`;
  return `${Math.floor(s / 3600)} h ${Math.floor((s % 3600) / 60)} min`;
}
