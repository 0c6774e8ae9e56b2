import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { CaptureImporter, CaptureImportError, importCapture } from "@/lib/analysis";
import { synthCaptureCsv } from "../../helpers/signals";

const BASE = { frequencyHz: 1000, sampleRateHz: 100_000, samples: 200, amplitudeV: 1, noiseVrms: 0.001, seed: 3 };

function rows(count: number, make: (i: number) => string): string {
  return Array.from({ length: count }, (_, i) => make(i)).join("\n");
}

function rejection(input: string | Uint8Array): CaptureImportError {
  try {
    importCapture(input);
  } catch (error) {
    if (error instanceof CaptureImportError) return error;
    throw error;
  }
  throw new Error("the import was expected to fail");
}

describe("importCapture", () => {
  it("reads a comma file with a preamble, a header with units and two channels", () => {
    const capture = importCapture(synthCaptureCsv({ ...BASE, second: { gainDb: -6, phaseDeg: 90 }, preamble: { Probe: "10x", Operator: "bench 2" } }));
    expect(capture.metadata).toEqual({ Probe: "10x", Operator: "bench 2" });
    expect(capture.columns.map((c) => [c.name, c.unit, c.kind])).toEqual([
      ["Time", "s", "time"],
      ["Out", "V", "voltage"],
      ["In", "V", "voltage"],
    ]);
    expect(capture.samples).toBe(200);
    expect(capture.sampleRateHz).toBeCloseTo(100_000, 3);
    expect(capture.channels.map((c) => c.name)).toEqual(["Out", "In"]);
    expect(capture.headerLine).toBe(3);
  });

  it("reads semicolons with decimal commas, CRLF, a BOM, µs and mV", () => {
    const csv = synthCaptureCsv({ ...BASE, delimiter: ";", decimalComma: true, lineEnding: "\r\n", byteOrderMark: true, timeUnit: "µs", voltageUnit: "mV" });
    expect(csv).toContain("Time (µs);Out (mV)\r\n");
    const capture = importCapture(csv);
    const reference = importCapture(synthCaptureCsv(BASE));
    expect(capture.delimiter).toBe(";");
    expect(capture.sampleRateHz).toBeCloseTo(100_000, 3);
    for (let i = 0; i < 200; i += 13) expect(capture.channels[0].samples[i]).toBeCloseTo(reference.channels[0].samples[i], 9);
  });

  it("reads tabs, quoted fields, scientific notation, brackets, bare t and blank lines", () => {
    const body = rows(80, (i) => `"${(i * 2).toExponential(3)}"\t${(0.5 * Math.sin(i / 3)).toExponential(6)}\t${i % 7}`);
    const capture = importCapture(`t [ms]\t"Probe A [V]"\tMarker [count]\n\n${body}\n\n\n`);
    expect(capture.columns.map((c) => c.kind)).toEqual(["time", "voltage", "other"]);
    expect(capture.sampleRateHz).toBeCloseTo(500, 9);
    expect(capture.samples).toBe(80);
    expect(capture.channels[0].samples[3]).toBeCloseTo(0.5 * Math.sin(1), 6);
  });

  it("takes the sample interval from the preamble when there is no time column", () => {
    const capture = importCapture(`Sample Interval,2e-6\nCH1 (V)\n${rows(100, (i) => String(Math.cos(i)))}\n`);
    expect(capture.timeSource).toBe("preamble");
    expect(capture.sampleRateHz).toBeCloseTo(500_000, 6);
  });

  it("takes the sample rate from the preamble, with its unit", () => {
    const capture = importCapture(`Sample Rate;2,5 MSa/s\nOut\n${rows(100, (i) => String(i % 3).replace(".", ","))}\n`);
    expect(capture.sampleRateHz).toBeCloseTo(2.5e6, 3);
  });

  it("gives the same capture however the bytes are chunked", () => {
    const bytes = new TextEncoder().encode(synthCaptureCsv({ ...BASE, samples: 300, second: { gainDb: 3, phaseDeg: -20 } }));
    const whole = importCapture(bytes);
    fc.assert(
      fc.property(fc.array(fc.integer({ min: 1, max: bytes.length - 1 }), { maxLength: 12 }), (cuts) => {
        const points = [0, ...new Set(cuts)].sort((a, b) => a - b);
        const chunks = points.map((p, i) => bytes.subarray(p, points[i + 1] ?? bytes.length));
        const capture = importCapture(chunks);
        expect(capture.samples).toBe(whole.samples);
        expect(capture.channels[1].samples).toEqual(whole.channels[1].samples);
      }),
      { numRuns: 60, seed: 42 },
    );
  });

  it("parses numbers exactly as Number() does, long mantissas and extreme exponents included", () => {
    // The 18-digit mantissa (above 2^53) is scaled down to stay inside the ±1e9 V a channel may hold.
    const values = ["0.1", "-2.5e-3", "+7", "3.", ".25", "1.2345678901234567890", "9.999999999999999e-250", "123456789012345678e-10"];
    const capture = importCapture(`t,v\n${values.map((v, i) => `${i},${v}`).join("\n")}\n${rows(60, (i) => `${i + 8},0`)}\n`);
    values.forEach((v, i) => expect(capture.channels[0].samples[i]).toBe(Number(v)));
  });
});

describe("importCapture rejections", () => {
  it("rejects an empty file", () => {
    expect(rejection("").message).toBe("empty file: no header row and no data");
    expect(rejection("\n\r\n  \n").message).toBe("empty file: no header row and no data");
  });

  it("rejects a header without data", () => {
    expect(rejection("Probe,10x\nTime (s),Out (V)\n\n").message).toBe("header only: no data rows after the header on line 2");
  });

  it("rejects fewer than 64 samples", () => {
    expect(rejection(`t,v\n${rows(63, (i) => `${i},1`)}`).message).toBe("only 63 samples; at least 64 are needed for an analysis");
  });

  it("rejects a non-numeric value, naming the line and column", () => {
    const csv = `Time (s),Out (V)\n${rows(100, (i) => `${i},${i === 40 ? "abc" : "0.5"}`)}`;
    const error = rejection(csv);
    expect(error.message).toBe("line 42: 'abc' is not a number in column Out (V)");
    expect(error.line).toBe(42);
  });

  it("rejects an empty cell and a short row", () => {
    expect(rejection(`t,v\n${rows(100, (i) => (i === 5 ? `${i},` : `${i},1`))}`).message).toBe("line 7: empty value in column v");
    expect(rejection(`t,v,w\n${rows(100, (i) => (i === 9 ? `${i},1` : `${i},1,2`))}`).message).toBe(
      "line 11: expected 3 values (one per header column), found 2",
    );
  });

  it("rejects binary content", () => {
    const png = Uint8Array.of(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 0x0d, 0x49, 0x48, 0x44, 0x52);
    expect(rejection(png).message).toMatch(/^binary content/);
    // Past the head (the first 16 kB are checked whole), a row with control bytes names its line.
    expect(rejection(`t,v\n${rows(4000, (i) => `${i},1`)}\n5\u0000\u0001,2\n`).message).toMatch(/^line 4002: binary content/);
    expect(rejection(Uint8Array.of(0xff, 0xfe, 0x74, 0x00)).message).toMatch(/UTF-16/);
  });

  it("rejects time that does not increase", () => {
    const error = rejection(`Time (s),Out (V)\n${rows(100, (i) => `${i === 30 ? 28 : i},0`)}`);
    expect(error.message).toBe("line 32: time 28 is not after the previous sample's 29; time must be strictly increasing");
  });

  it("rejects sample spacing irregular by more than 1 %", () => {
    const error = rejection(`Time (s),Out (V)\n${rows(100, (i) => `${i + (i >= 50 ? 0.02 : 0)},0`)}`);
    expect(error.message).toMatch(/^line 52: sample spacing 1\.02\d* differs from the record's mean spacing 1\.00000 by more than 1% plus the stamps' printed precision \(±0\.0050\): a missing row or a restarted time base\?/);
    expect(() => importCapture(`t,v\n${rows(100, (i) => `${i + (i % 2) * 0.004},0`)}`)).not.toThrow();
  });

  it("accepts stamps rounded to 7 significant digits (a least-squares line recovers the rate) and still names a missing row", () => {
    // 1 MS/s starting at 12.3456789 ms: printed with 7 significant digits the steps read 0, 1 or 2 × 10⁻⁹ s off.
    const t0 = 0.0123456789;
    const stamped = (i: number) => (t0 + i * 1e-6).toPrecision(7);
    const capture = importCapture(`Time (s),Out (V)\n${rows(5000, (i) => `${stamped(i)},${Math.sin(i / 7).toFixed(6)}`)}`);
    expect(Math.abs(capture.sampleRateHz / 1e6 - 1)).toBeLessThan(1e-6);
    const gap = rejection(`Time (s),Out (V)\n${rows(5000, (i) => `${stamped(i < 3000 ? i : i + 1)},${Math.sin(i / 7).toFixed(6)}`)}`);
    expect(gap.line).toBe(3002);
    expect(gap.message).toMatch(/a missing row or a restarted time base/);
  });

  it("rejects a subnormal time step, whose sample rate would overflow to Infinity", () => {
    const error = rejection(`Time (s),Out (V)\n${rows(100, (i) => `${(i * 1e-310).toExponential(6)},${Math.sin(i / 5).toFixed(6)}`)}`);
    expect(error.message).toBe("line 3: sample interval 1e-310 s is too small to give a finite sample rate");
    expect(error.line).toBe(3);
    // Scaled by the column's unit: 1e-301 ns is 1e-310 s.
    expect(rejection(`t (ns),v\n${rows(100, (i) => `${i * 1e-301},0`)}`).message).toBe(
      "line 3: sample interval 1e-310 s is too small to give a finite sample rate",
    );
  });

  it("rejects a preamble clock that gives no finite positive sample rate, naming its line", () => {
    const body = rows(100, (i) => String(Math.cos(i)));
    expect(rejection(`Probe,1x\nSample Interval,1e-310\nCH1 (V)\n${body}`).message).toBe(
      "line 2: 'Sample Interval' gives a sample interval of 1e-310 s, too small to give a finite sample rate",
    );
    expect(rejection(`Sample Rate,1e-320 Hz\nCH1 (V)\n${body}`).message).toBe(
      "line 1: 'Sample Rate' gives a sample interval of Infinity s, too large to give a non-zero sample rate",
    );
  });

  it("rejects volts beyond ±1e9 V, naming the line and the column, on the fast and the slow path", () => {
    // A 1e200 V sine overflows the engine's power sums and reads at a wrong frequency; no scope gives that.
    const sine = (i: number) => (1e200 * Math.sin(i / 5)).toExponential(6);
    expect(rejection(`Time (s),Out (V)\n${rows(100, (i) => `${i * 1e-8},${i === 0 ? "0" : sine(i)}`)}`).message).toBe(
      `line 3: '${sine(1)}' in column Out (V) is beyond ±1e9 V, which is not a measurement a scope can make`,
    );
    // Scaled first: 2e12 mV is 2e9 V; a quoted cell takes the slow path.
    const error = rejection(`t,In (V),Out (mV)\n${rows(100, (i) => `${i},0,${i === 50 ? '"2e12"' : "1"}`)}`);
    expect(error.message).toBe("line 52: '2e12' in column Out (mV) is beyond ±1e9 V, which is not a measurement a scope can make");
    expect(error.line).toBe(52);
    expect(rejection(`t,v\n${rows(100, (i) => `${i},${i === 7 ? "-1.0000001e9" : "1"}`)}`).message).toMatch(/^line 9: '-1.0000001e9' in column v is beyond/);
    expect(importCapture(`t,v\n${rows(100, (i) => `${i},${i % 2 ? "1e9" : "-1e9"}`)}`).channels[0].samples[1]).toBe(1e9);
  });

  it("rejects a file without a time column or a preamble clock", () => {
    expect(rejection(`Out (V)\n${rows(100, () => "1")}`).message).toMatch(/^no time column/);
  });

  it("rejects a header without a voltage column, and a time column in an unknown unit", () => {
    expect(rejection(`Time (s),Current (A)\n${rows(100, (i) => `${i},1`)}`).message).toMatch(/^line 1: no voltage column/);
    expect(rejection(`Time (min),Out (V)\n${rows(100, (i) => `${i},1`)}`).message).toBe(
      "line 1: unknown time unit 'min' in column Time (min); use s, ms, us, µs or ns",
    );
  });

  it("rejects numbers without a header row", () => {
    expect(rejection(rows(100, (i) => `${i},1`)).message).toMatch(/^line 1: no header row/);
  });
});

describe("CaptureImporter", () => {
  it("refuses to be used after finish()", () => {
    const importer = new CaptureImporter();
    importer.push(new TextEncoder().encode(`t,v\n${rows(70, (i) => `${i},1`)}`));
    importer.finish();
    expect(() => importer.push(new Uint8Array(1))).toThrow(TypeError);
  });

  it("only ever returns a capture or throws CaptureImportError on random bytes (fast-check)", () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 400 }), (bytes) => {
        try {
          importCapture(bytes);
        } catch (error) {
          expect(error).toBeInstanceOf(CaptureImportError);
          expect((error as Error).message).not.toContain("\n");
        }
      }),
      { numRuns: 400, seed: 7 },
    );
  });

  it("only ever returns a capture or throws CaptureImportError on random text rows (fast-check)", () => {
    const cell = fc.oneof(fc.double({ noNaN: false }).map(String), fc.constantFrom("", " ", '"', "1e", "-", ",", ";", "\t", "1,5", "abc"), fc.string({ maxLength: 4 }));
    const line = fc.array(cell, { minLength: 1, maxLength: 4 }).map((cells) => cells.join(","));
    fc.assert(
      fc.property(fc.array(line, { maxLength: 90 }), fc.constantFrom("\n", "\r\n"), (lines, eol) => {
        try {
          importCapture(["Time (s),Out (V),In (mV)", ...lines].join(eol));
        } catch (error) {
          expect(error).toBeInstanceOf(CaptureImportError);
        }
      }),
      { numRuns: 300, seed: 11 },
    );
  });

  it("only ever returns a capture or throws CaptureImportError on mutated captures (fast-check)", () => {
    const valid = new TextEncoder().encode(synthCaptureCsv({ ...BASE, samples: 90, second: { gainDb: 0, phaseDeg: 10 }, preamble: { Note: "x" } }));
    const mutation = fc.record({ at: fc.nat({ max: valid.length - 1 }), kind: fc.constantFrom("replace", "delete", "insert"), byte: fc.integer({ min: 0, max: 255 }) });
    fc.assert(
      fc.property(fc.array(mutation, { minLength: 1, maxLength: 8 }), (mutations) => {
        const bytes = Array.from(valid);
        for (const m of mutations) {
          const at = Math.min(m.at, bytes.length - 1);
          if (m.kind === "replace") bytes[at] = m.byte;
          else if (m.kind === "delete") bytes.splice(at, 1);
          else bytes.splice(at, 0, m.byte);
        }
        try {
          importCapture(Uint8Array.from(bytes));
        } catch (error) {
          expect(error).toBeInstanceOf(CaptureImportError);
        }
      }),
      { numRuns: 400, seed: 13 },
    );
  });
});
