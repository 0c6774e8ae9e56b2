import { describe, expect, it } from "vitest";
import { formatBytes, formatDuration, formatRate } from "@/lib/format/bytes";
import { DASH } from "@/lib/format/numbers";

describe("formatBytes", () => {
  it("small_counts_in_bytes", () => {
    expect(formatBytes(0)).toBe("0 B");
    expect(formatBytes(999)).toBe("999 B");
  });
  it("decimal_prefixes", () => {
    expect(formatBytes(1234)).toBe("1.23 kB");
    expect(formatBytes(734_003_200)).toBe("734 MB");
    expect(formatBytes(12_500_000)).toBe("12.5 MB");
  });
  it("negative_is_a_dash", () => {
    expect(formatBytes(-1)).toBe(DASH);
  });
});

describe("formatRate", () => {
  it("megabytes_per_second", () => {
    expect(formatRate(12_345_678)).toBe("12.3 MB/s");
    expect(formatRate(250_000)).toBe("0.25 MB/s");
  });
});

describe("formatDuration", () => {
  it("seconds_minutes_hours", () => {
    expect(formatDuration(4.2)).toBe("4 s");
    expect(formatDuration(75)).toBe("1 min 15 s");
    expect(formatDuration(3725)).toBe("1 h 2 min");
  });
});
