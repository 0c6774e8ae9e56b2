import { describe, expect, it } from "vitest";
import { importCapture } from "@/lib/analysis/csv-import";
import { CaptureImportError } from "@/lib/analysis/errors";
import { checkCaptureStart, decodeCaptureStart, sniffCaptureHeader } from "@/lib/capture-sniff/sniff-header";

function sniff(text: string, complete = true) {
  const result = sniffCaptureHeader(text, complete);
  if (!result.ok) throw new Error(`expected a header, got: ${result.message}`);
  return result.header;
}

describe("sniffCaptureHeader", () => {
  it("plain_comma_header_offers_voltage_columns", () => {
    const h = sniff("Time (s),Out (V),Supply (V)\n0,0.1,5\n1e-6,0.2,5\n");
    expect(h.delimiter).toBe(",");
    expect(h.headerLine).toBe(1);
    expect(h.channels.map((c) => c.name)).toEqual(["Out", "Supply"]);
    expect(h.timeColumn?.header).toBe("Time (s)");
    expect(h.firstRow).toEqual(["0", "0.1", "5"]);
  });

  it("quoted_header_cells_with_commas_inside", () => {
    const h = sniff('"Time (s)","Out, buffered (mV)","Tap (V)"\n0,1.5,0.2\n');
    expect(h.columns.map((c) => c.header)).toEqual(["Time (s)", "Out, buffered (mV)", "Tap (V)"]);
    expect(h.channels.map((c) => c.unit)).toEqual(["mV", "V"]);
  });

  it("semicolon_delimiter_with_decimal_commas", () => {
    const h = sniff("t [us];CH A [mV]\n0,0;12,5\n0,1;13,0\n");
    expect(h.delimiter).toBe(";");
    expect(h.channels).toHaveLength(1);
    expect(h.channels[0].name).toBe("CH A");
    expect(h.timeColumn?.unit).toBe("us");
  });

  it("tab_delimiter", () => {
    const h = sniff("time\tout (V)\n0\t0.5\n");
    expect(h.delimiter).toBe("\t");
    expect(h.channels[0].header).toBe("out (V)");
  });

  it("utf8_bom_is_ignored", () => {
    const h = sniff("\ufeffTime (s),Out (V)\r\n0,0.1\r\n");
    expect(h.columns[0].kind).toBe("time");
    expect(h.columns[0].header).toBe("Time (s)");
  });

  it("preamble_lines_become_metadata_and_shift_the_header_line", () => {
    const text = ["Model,Bench capture", "Sample Interval,1e-6", "Probe,10x", "", "Time (s),Out (V)", "0,0.1", "1e-6,0.2", ""].join(
      "\n",
    );
    const h = sniff(text);
    expect(h.headerLine).toBe(5);
    expect(h.preamble).toEqual({ Model: "Bench capture", "Sample Interval": "1e-6", Probe: "10x" });
  });

  it("a_stray_text_line_after_the_header_is_refused_on_its_line_as_the_importer_does", () => {
    const r = sniffCaptureHeader("Time (s),Out (V)\nunits follow,\n0,0.1\n", false);
    expect(r).toEqual({ ok: false, message: "Line 2: 'units follow' is not a number in column Time (s)." });
  });

  it("cut_last_line_of_a_partial_read_is_dropped", () => {
    const h = sniff("Time (s),Out (V)\n0,0.1\n1e-6,0.2", false);
    expect(h.firstRow).toEqual(["0", "0.1"]);
  });

  it("no_numeric_rows_gives_a_message", () => {
    const r = sniffCaptureHeader("just,some\ntext,here\n", true);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/No rows of numbers/);
  });

  it("numbers_on_the_first_line_means_no_header", () => {
    const r = sniffCaptureHeader("0,0.1\n1,0.2\n", true);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/header row/);
  });

  it("no_voltage_column_gives_a_message", () => {
    const r = sniffCaptureHeader("Time (s),Current (A)\n0,0.1\n", true);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/No voltage column/);
  });

  it("unknown_time_unit_is_refused_in_the_importer_s_words", () => {
    const r = sniffCaptureHeader("Time (fortnights),Out (V)\n0,0.1\n", false);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toBe("Line 1: unknown time unit 'fortnights' in column Time (fortnights); use s, ms, us, µs or ns.");
  });
});

describe("decodeCaptureStart", () => {
  it("utf8_text_decodes", () => {
    const r = decodeCaptureStart(new TextEncoder().encode("Time (µs),Out (V)\n"));
    expect(r).toEqual({ ok: true, text: "Time (µs),Out (V)\n" });
  });

  it("utf16_is_refused", () => {
    const r = decodeCaptureStart(new Uint8Array([0xff, 0xfe, 0x54, 0x00]));
    expect(r.ok).toBe(false);
  });

  it("binary_is_refused", () => {
    const r = decodeCaptureStart(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x00]));
    expect(r.ok).toBe(false);
  });
});

/** The importer's verdict on a whole file: its message, or null when it reads it. */
function importerSays(text: string): string | null {
  try {
    importCapture(text);
    return null;
  } catch (err) {
    if (err instanceof CaptureImportError) return err.message;
    throw err;
  }
}

const rows = (n: number, row: (i: number) => string) => Array.from({ length: n }, (_, i) => row(i)).join("\n") + "\n";

describe("checkCaptureStart agrees with the importer", () => {
  const encode = (text: string) => new TextEncoder().encode(text);

  it("refuses_a_png_up_front_as_binary", () => {
    // The PNG signature and the start of an IHDR chunk (ISO/IEC 15948: 89 50 4E 47 0D 0A 1A 0A).
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 0x49, 0x48, 0x44, 0x52]);
    const r = checkCaptureStart(png, true);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/binary/);
  });

  it("refuses_a_semicolon_file_headed_zeit_without_a_clock_like_the_importer", () => {
    const text = "Zeit (s);Kanal 1 (V)\n" + rows(100, (i) => `${(i * 1e-6).toFixed(6).replace(".", ",")};${Math.sin(i / 5).toFixed(3).replace(".", ",")}`);
    expect(importerSays(text)).toMatch(/no time column/);
    const r = checkCaptureStart(encode(text), true);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.message).toMatch(/^No time column \(a header named 'time' or 't'\) and no sample interval or sample rate in the preamble\.$/);
  });

  it("accepts_the_same_zeit_file_once_the_preamble_gives_the_rate_and_says_where_the_clock_comes_from", () => {
    const text = "Sample Rate: 1 MSa/s\nZeit (s);Kanal 1 (V)\n" + rows(100, (i) => `${i};${Math.sin(i / 5).toFixed(3).replace(".", ",")}`);
    expect(importerSays(text)).toBeNull();
    const r = checkCaptureStart(encode(text), true);
    expect(r.ok).toBe(true);
    if (r.ok) expect(r.header.preambleClock).toEqual({ key: "Sample Rate: 1 MSa/s", sampleRate: "1 MS/s" });
  });

  it("refuses_notes_and_a_header_only_export", () => {
    const notes = checkCaptureStart(encode("Bench notes\nC2 swapped for 27n, ran warm.\n"), true);
    expect(notes).toEqual({ ok: false, message: "No rows of numbers found: is this a capture CSV?" });
    const headerOnly = checkCaptureStart(encode("Time (s),Out (V)\n"), true);
    expect(importerSays("Time (s),Out (V)\n")).toMatch(/header only/);
    expect(headerOnly).toEqual({ ok: false, message: "Header only: no data rows after the header on line 1." });
  });

  it("leaves_a_bad_value_further_down_to_the_analysis", () => {
    const text = "Time (s),Out (V)\n" + rows(100, (i) => `${i * 1e-6},${i === 60 ? "abc" : "0.1"}`);
    expect(importerSays(text)).toMatch(/^line 62: /);
    expect(checkCaptureStart(encode(text), true).ok).toBe(true);
  });
});
