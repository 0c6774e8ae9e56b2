import { describe, expect, it } from "vitest";
import { importCapture } from "@/lib/analysis/csv-import";
import { findPreambleTiming } from "@/lib/analysis/preamble";

/** The preamble as the importer keys it: one cell per line when the line has no delimiter. */
function intervalOf(lines: string[]): number | undefined {
  const text = [...lines, "Out (V)", ...Array.from({ length: 80 }, (_, i) => (Math.sin(i / 4) * 0.5).toFixed(4)), ""].join("\n");
  return 1 / importCapture(text).sampleRateHz;
}

describe("findPreambleTiming spellings", () => {
  it.each([
    [["Sample Rate: 1 MSa/s"], 1e-6],
    [["Sampling rate,1e6"], 1e-6],
    [["fs = 1 MHz"], 1e-6],
    [["Sample interval 1e-6 s"], 1e-6],
    [["Sample Rate,2.5 MS/s"], 4e-7],
    [["Sample Rate = 500 kSa/s"], 2e-6],
    [["SampleRate,250 ksps"], 4e-6],
    [["Sample rate: 10 samples/s"], 0.1],
    [["dt: 2 us"], 2e-6],
    [["X Increment,5e-9"], 5e-9],
  ])("reads %j as a %s s interval", (lines, intervalS) => {
    expect(intervalOf(lines)).toBeCloseTo(intervalS, 15);
  });

  it("keeps the key as written, so the form and errors can name the line", () => {
    expect(findPreambleTiming({ "Sample Rate: 1 MSa/s": "" })).toEqual({ key: "Sample Rate: 1 MSa/s", sampleIntervalS: 1e-6 });
  });

  it("reads a lower-case m before Hz as mega: no scope samples at millihertz", () => {
    expect(findPreambleTiming({ "Sample Rate": "1 mHz" })?.sampleIntervalS).toBe(1e-6);
  });

  it("ignores lines that only look alike: a rate in seconds, a model name with a number, a timebase", () => {
    expect(findPreambleTiming({ "Sample Rate: 1 s": "" })).toBeUndefined();
    expect(findPreambleTiming({ "Model 2024": "" })).toBeUndefined();
    expect(findPreambleTiming({ Timebase: "1 us/div" })).toBeUndefined();
  });

  it("takes the first usable figure when two lines give one", () => {
    expect(findPreambleTiming({ "Sample Rate": "fast", "Sample Interval": "1e-6", fs: "2 MHz" })).toEqual({ key: "Sample Interval", sampleIntervalS: 1e-6 });
  });
});
