import { describe, expect, it } from "vitest";
import { decodeCaptureStart, sniffCaptureHeader } from "@/lib/capture-sniff/sniff-header";

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

  it("header_naming_columns_wins_over_a_stray_text_line_after_it", () => {
    const h = sniff("Time (s),Out (V)\nunits follow,\n0,0.1\n");
    expect(h.headerLine).toBe(1);
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

  it("unknown_time_unit_still_reads_as_a_header", () => {
    const h = sniff("Time (fortnights),Out (V)\n0,0.1\n");
    expect(h.timeColumn?.header).toBe("Time (fortnights)");
    expect(h.channels.map((c) => c.name)).toEqual(["Out"]);
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
