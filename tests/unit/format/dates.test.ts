import { describe, expect, it } from "vitest";
import { formatDate, formatDateTime } from "@/lib/format/dates";
import { DASH } from "@/lib/format/numbers";

describe("formatDateTime", () => {
  it("iso_string_in_utc", () => {
    expect(formatDateTime("2026-12-01T14:32:09Z", { timeZone: "UTC" })).toBe("2026-12-01 14:32");
  });
  it("with_seconds", () => {
    expect(formatDateTime(Date.UTC(2026, 0, 5, 3, 4, 5), { timeZone: "UTC", seconds: true })).toBe("2026-01-05 03:04:05");
  });
  it("invalid_is_a_dash", () => {
    expect(formatDateTime("not a date")).toBe(DASH);
    expect(formatDateTime(null)).toBe(DASH);
  });
});

describe("formatDate", () => {
  it("date_part_only", () => {
    expect(formatDate("2026-12-01T14:32:09Z", { timeZone: "UTC" })).toBe("2026-12-01");
  });
});
