/**
 * Finds a capture's header row in the first bytes of a CSV, in the browser, so the upload form can offer the
 * file's voltage columns as channel choices before anything is uploaded. Pure: it takes text, not a File.
 *
 * The rules follow the analysis importer (lib/analysis/csv-import.ts) so the form offers what the worker will
 * accept: optional preamble `key,value` lines, one header row, then numeric rows; comma, semicolon or tab
 * delimiters; quoted cells; a UTF-8 byte-order mark; CRLF or LF. Column cells are read by the importer's own
 * {@link parseColumnHeader}, and once the header is found the lines up to the first data row go through the
 * importer itself ({@link CaptureImporter}), so every refusal the importer makes of a header (an unknown time unit,
 * no voltage column, no clock) is made here too, in its words. The server runs the same check on the stored file's
 * first bytes before a run exists (lib/logbook/capture-precheck.ts). Rows are not judged here: a bad value further
 * down stays the analysis's finding, reported on its line in a failed run.
 */
import { parseColumnHeader, type CaptureColumn } from "@/lib/analysis/columns";
import { CaptureImporter } from "@/lib/analysis/csv-import";
import { CaptureImportError } from "@/lib/analysis/errors";
import { formatSampleRate } from "@/lib/analysis/format-rate";
import { findPreambleTiming } from "@/lib/analysis/preamble";
import {
  guessDelimiter,
  isNumericLine,
  namesAColumn,
  splitCells,
  type CaptureDelimiter,
} from "@/lib/analysis/header-lines";

export type { CaptureDelimiter };

/** Bytes of the file the upload form reads to find the header: enough for long preambles, tiny next to a capture. */
export const SNIFF_BYTES = 64 * 1024;


export interface SniffedColumn {
  /** 0-based position in the row. */
  index: number;
  /** The header cell as written, trimmed, quotes removed. */
  header: string;
  /** The name without its unit, e.g. "Out" for "Out (mV)". */
  name: string;
  unit: string;
  kind: CaptureColumn["kind"];
}

export interface SniffedHeader {
  delimiter: CaptureDelimiter;
  /** 1-based line number of the header row. */
  headerLine: number;
  columns: SniffedColumn[];
  /** The voltage columns: the channel choices. */
  channels: SniffedColumn[];
  /** The time column, when there is one. */
  timeColumn?: SniffedColumn;
  /** Preamble `key → value` lines before the header, in file order. */
  preamble: Record<string, string>;
  /** The first data row's cells, for a preview line. */
  firstRow: string[];
  /** Without a time column: the preamble line that gives the clock, and the rate it gives ("1 MS/s"). */
  preambleClock?: { key: string; sampleRate: string };
}

export type SniffResult = { ok: true; header: SniffedHeader } | { ok: false; message: string };

/** An importer message as a sentence: "line 3: no voltage column…" → "Line 3: no voltage column….". */
function sentence(message: string): string {
  const text = message.charAt(0).toUpperCase() + message.slice(1);
  return /[.?!]$/.test(text) ? text : `${text}.`;
}

/**
 * What the importer says about the start of a capture: null when it reads the header, else its refusal.
 * @param text - the lines up to and including the first data row (or a whole file without one)
 * @param complete - `text` is the whole file, so the importer also finishes (a header with no rows after it)
 */
export function importerRefusal(text: string, complete: boolean): string | null {
  const importer = new CaptureImporter();
  try {
    importer.push(new TextEncoder().encode(text));
    if (complete) importer.finish();
    return null;
  } catch (err) {
    if (err instanceof CaptureImportError) return sentence(err.message);
    throw err;
  }
}

function readColumn(cell: string, index: number, lineNumber: number): SniffedColumn {
  if (cell === "") return { index, header: "", name: "", unit: "", kind: "other" };
  try {
    const column = parseColumnHeader(cell, lineNumber);
    return { index, header: column.header, name: column.name, unit: column.unit, kind: column.kind };
  } catch {
    // A time column with a unit the importer refuses: show it as a column, the worker reports the unit.
    return { index, header: cell, name: cell, unit: "", kind: "time" };
  }
}

interface Line {
  text: string;
  lineNumber: number;
}

/**
 * Finds the header row and the channel columns in the start of a capture CSV.
 *
 * @param text - the decoded first bytes of the file (see {@link SNIFF_BYTES}); a leading BOM is ignored.
 * @param complete - true when `text` is the whole file; otherwise the last, possibly cut, line is dropped.
 * @returns `{ ok: true, header }`, or `{ ok: false, message }` saying in plain words why no channel can be offered.
 */
export function sniffCaptureHeader(text: string, complete = false): SniffResult {
  let body = text.startsWith("\ufeff") ? text.slice(1) : text;
  if (!complete) {
    const lastNewline = body.lastIndexOf("\n");
    body = lastNewline < 0 ? "" : body.slice(0, lastNewline + 1);
  }
  const lines: Line[] = body
    .split("\n")
    .map((raw, i) => ({ text: raw.endsWith("\r") ? raw.slice(0, -1) : raw, lineNumber: i + 1 }));

  const firstDataIndex = lines.findIndex((line) => line.text.trim() !== "" && isNumericLine(line.text));
  if (firstDataIndex < 0) {
    // A whole file that names columns but holds no numbers is a header-only export: the importer words it.
    const refusal = complete && lines.some((line) => namesAColumn(line.text)) ? importerRefusal(body, true) : null;
    if (refusal) return { ok: false, message: refusal };
    return {
      ok: false,
      message: complete
        ? "No rows of numbers found: is this a capture CSV?"
        : `No rows of numbers in the first ${SNIFF_BYTES / 1024} kB: is this a capture CSV?`,
    };
  }
  const firstData = lines[firstDataIndex];
  const dataCells = splitCells(firstData.text, guessDelimiter(firstData.text));

  let headerIndex = -1;
  for (let i = firstDataIndex - 1; i >= 0; i--) {
    const candidate = lines[i].text;
    if (candidate.trim() === "") continue;
    if (headerIndex < 0) headerIndex = i;
    if (namesAColumn(candidate) && splitCells(candidate, guessDelimiter(candidate)).length === dataCells.length) {
      headerIndex = i;
      break;
    }
  }
  if (headerIndex < 0) {
    return { ok: false, message: "The first line already holds numbers: the file needs a header row naming its columns." };
  }

  const headerLine = lines[headerIndex];
  const headerDelimiter = guessDelimiter(headerLine.text);
  const headerCells = splitCells(headerLine.text, headerDelimiter);
  const delimiter = headerCells.length > 1 ? headerDelimiter : guessDelimiter(firstData.text);
  const columns = headerCells.map((cell, i) => readColumn(cell, i, headerLine.lineNumber));

  const preamble: Record<string, string> = {};
  for (const line of lines.slice(0, headerIndex)) {
    if (line.text.trim() === "") continue;
    const cells = splitCells(line.text, guessDelimiter(line.text));
    const key = cells[0] ?? "";
    if (key !== "" && !(key in preamble)) preamble[key] = cells.slice(1).filter((c) => c !== "").join(" ");
  }

  const channels = columns.filter((column) => column.kind === "voltage");
  if (channels.length === 0) {
    return {
      ok: false,
      message: `No voltage column in the header "${headerLine.text.trim()}": name a column with a unit of V or mV.`,
    };
  }
  const headText = lines
    .slice(0, firstDataIndex + 1)
    .map((line) => `${line.text}\n`)
    .join("");
  const refusal = importerRefusal(headText, false);
  if (refusal) return { ok: false, message: refusal };
  const timeColumn = columns.find((column) => column.kind === "time");
  const timing = timeColumn ? undefined : findPreambleTiming(preamble);
  return {
    ok: true,
    header: {
      delimiter,
      headerLine: headerLine.lineNumber,
      columns,
      channels,
      timeColumn,
      preamble,
      firstRow: dataCells,
      ...(timing ? { preambleClock: { key: timing.key, sampleRate: formatSampleRate(1 / timing.sampleIntervalS) } } : {}),
    },
  };
}

/**
 * The whole pre-check of a capture's first bytes, as the upload form and the server both run it: the text
 * encoding, then {@link sniffCaptureHeader} (which runs the importer's own rules).
 * @param bytes - the file's first {@link SNIFF_BYTES} bytes, or all of it
 * @param complete - `bytes` is the whole file
 */
export function checkCaptureStart(bytes: Uint8Array, complete: boolean): SniffResult {
  const decoded = decodeCaptureStart(bytes);
  if (!decoded.ok) return decoded;
  return sniffCaptureHeader(decoded.text, complete);
}

/**
 * Decodes the first bytes of a file as UTF-8, refusing UTF-16 (which the importer refuses too).
 *
 * @param bytes - the file's first bytes.
 * @returns the text, or a message when the bytes are UTF-16 or binary.
 */
export function decodeCaptureStart(bytes: Uint8Array): { ok: true; text: string } | { ok: false; message: string } {
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    return { ok: false, message: "The file is UTF-16 text; save the capture as UTF-8 or ASCII CSV." };
  }
  // A cut multi-byte character at the end decodes to U+FFFD, which only touches the dropped last line.
  const text = new TextDecoder("utf-8").decode(bytes);
  if (/[\u0000-\u0008\u000b\u000e-\u001f\u007f]/.test(text)) {
    return { ok: false, message: "The file holds binary data, not CSV text." };
  }
  return { ok: true, text };
}
