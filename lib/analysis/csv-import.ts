import Papa from "papaparse";
import { type CaptureColumn, parseColumnHeader } from "./columns";
import { CaptureImportError } from "./errors";
import { type CaptureDelimiter, guessDelimiter, isNumericLine, namesAColumn, splitCells } from "./header-lines";
import { findPreambleTiming } from "./preamble";
import { CONTROL_CHARACTER, MAX_ABS_VOLTS, type ParsedRows, ROLE_SKIP, ROLE_TIME, type RowLayout, RowParser } from "./row-parser";

export { MAX_ABS_VOLTS };

/** One voltage column of a capture, in volts. */
export interface CaptureChannel {
  /** Column name without its unit, e.g. `Out`. */
  name: string;
  /** The header cell as written, e.g. `Out (mV)`. */
  header: string;
  /** Samples in volts (already scaled from mV etc.). */
  samples: Float64Array;
}

/** Where the sample clock came from. */
export type TimeSource = "time-column" | "preamble";

/** A capture read from CSV: its metadata, its columns and its voltage samples. */
export interface Capture {
  /** Preamble `key,value` lines before the header row, in file order. */
  metadata: Record<string, string>;
  /** Every header column, including ignored ones. */
  columns: CaptureColumn[];
  /** Voltage columns in file order. */
  channels: CaptureChannel[];
  /** Number of samples per channel. */
  samples: number;
  sampleRateHz: number;
  /** Time of the first sample in seconds (0 when the clock comes from the preamble). */
  startTimeS: number;
  timeSource: TimeSource;
  delimiter: CaptureDelimiter;
  /** 1-based line of the header row. */
  headerLine: number;
}

/** Options for {@link CaptureImporter}. */
export interface CaptureImportOptions {
  /** Size of the whole file in bytes, when known: lets the importer allocate its arrays once. */
  sizeHintBytes?: number;
  /**
   * Keep the samples in SharedArrayBuffers (the channels are still Float64Arrays), so a command can
   * hand them to another thread without copying, and let another thread parse part of the rows.
   */
  sharedMemory?: boolean;
}

/** The fewest samples the engine accepts: below this no spectrum or fit means anything. */
export const MIN_SAMPLES = 64;

const LF = 0x0a;
const HEAD_LIMIT_BYTES = 1 << 20;
const HEAD_SLICE_BYTES = 1 << 14;
const LINE_LIMIT_BYTES = 1 << 20;

interface HeadLine {
  text: string;
  lineNumber: number;
  /** Offset in the head buffer just after this line's line feed. */
  end: number;
}

function concatBytes(a: Uint8Array, b: Uint8Array): Uint8Array {
  const joined = new Uint8Array(a.length + b.length);
  joined.set(a, 0);
  joined.set(b, a.length);
  return joined;
}

/**
 * Reads a capture CSV pushed in chunks (for example straight from a file stream), so that memory
 * grows with the samples kept and never with the file's text.
 *
 * Accepted: optional preamble `key,value` lines, one header row naming the columns, then data rows;
 * comma, semicolon or tab delimiters (decimal commas allowed unless the delimiter is a comma);
 * quoted fields; scientific notation; CRLF or LF; a UTF-8 byte-order mark; blank lines anywhere.
 * The time column is a header containing "time" or a bare "t" (units s, ms, us, µs, ns); voltage
 * columns are in V or mV (no unit means V), each value within ±{@link MAX_ABS_VOLTS}. Without a
 * time column the preamble must give the sample interval or sample rate.
 *
 * @example
 * const importer = new CaptureImporter({ sizeHintBytes: stat.size });
 * for await (const chunk of stream) importer.push(chunk);
 * const capture = importer.finish();
 */
export class CaptureImporter {
  private head = new Uint8Array(1 << 16);
  private headLength = 0;
  private headScanned = 0;
  private headLines: HeadLine[] = [];
  private headDecoder = new TextDecoder("utf-8");
  private started = false;
  private finished = false;
  private rows?: RowParser;
  private carry?: Uint8Array;
  private metadata: Record<string, string> = {};
  private columns: CaptureColumn[] = [];
  private delimiter: CaptureDelimiter = ",";
  private headerLine = 0;
  private preambleIntervalS?: number;
  private readonly sizeHintBytes?: number;
  private readonly sharedMemory: boolean;
  /** Bytes of the file before the first data row (after the byte-order mark, if any). */
  private dataStartBytes = 0;
  private bomBytes = 0;

  /** @param options - see {@link CaptureImportOptions} */
  constructor(options: CaptureImportOptions = {}) {
    this.sizeHintBytes = options.sizeHintBytes;
    this.sharedMemory = options.sharedMemory === true;
  }

  /**
   * Once the header is read: the layout of the data rows and where in the file they start, for a
   * parser of a later stretch of them ({@link parseRowStretch}); undefined before that.
   */
  rowLayout(): { layout: RowLayout; dataStartByte: number; rowsSoFar: number } | undefined {
    if (!this.rows || this.finished) return undefined;
    return { layout: this.rows.layout(), dataStartByte: this.bomBytes + this.dataStartBytes, rowsSoFar: this.rows.count };
  }

  /**
   * Hands the room for rows from `firstRow` on to a parser of a later stretch of the file (the
   * shared arrays it should fill, see {@link RowParserOptions.channels}); this importer keeps
   * filling the rows before it and copies itself elsewhere if there are more.
   * @returns the arrays, or undefined when there is no such room (then parse without them)
   */
  releaseTail(firstRow: number): Float64Array[] | undefined {
    if (!this.rows || !this.sharedMemory) return undefined;
    return this.rows.releaseTail(firstRow);
  }

  /**
   * Appends the rows another parser read from the bytes that follow everything pushed so far,
   * which must have ended just after a line feed. Their stamps are checked and summed in order,
   * exactly as if the bytes had been pushed.
   * @returns false, with nothing changed, when the rows cannot be taken this way (a stamp fails
   *   its check, the pushed bytes did not end a line, too few rows so far): push those bytes instead,
   *   which gives the exact error
   */
  pushParsedRows(rows: ParsedRows): boolean {
    if (this.finished) throw new TypeError("CaptureImporter.pushParsedRows called after finish()");
    if (!this.rows || (this.carry && this.carry.length > 0)) return false;
    return this.rows.appendRows(rows);
  }

  /**
   * Feeds the next chunk of the file.
   * @throws CaptureImportError as soon as the bytes seen so far are known to be bad
   */
  push(chunk: Uint8Array): void {
    if (this.finished) throw new TypeError("CaptureImporter.push called after finish()");
    if (chunk.length === 0) return;
    if (this.rows) {
      this.pushData(chunk, 0);
      return;
    }
    let bytes = chunk;
    if (!this.started) {
      this.started = true;
      if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
        throw new CaptureImportError("the file is UTF-16 text; save the capture as UTF-8 or ASCII CSV");
      }
      if (bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf) {
        bytes = bytes.subarray(3);
        this.bomBytes = 3;
      }
    }
    // Feed the head in small slices so a big chunk is not copied whole before the header is found;
    // once it is, the rest of the chunk goes straight to the row parser.
    for (let offset = 0; offset < bytes.length; offset += HEAD_SLICE_BYTES) {
      this.appendHead(bytes.subarray(offset, offset + HEAD_SLICE_BYTES));
      this.scanHead(false);
      if (this.rows) {
        if (offset + HEAD_SLICE_BYTES < bytes.length) this.pushData(bytes, offset + HEAD_SLICE_BYTES);
        return;
      }
    }
  }

  /**
   * Ends the input and returns the capture.
   * @returns the capture with its channels in volts and its sample rate in Hz
   * @throws CaptureImportError for an empty file, a header without data, fewer than 64 samples,
   *   or any bad row not yet reported
   */
  finish(): Capture {
    if (this.finished) throw new TypeError("CaptureImporter.finish called twice");
    this.finished = true;
    if (!this.rows) this.scanHead(true);
    const rows = this.rows;
    if (!rows) throw new CaptureImportError("empty file: no header row and no data");
    if (this.carry && this.carry.length > 0) {
      const last = concatBytes(this.carry, Uint8Array.of(LF));
      this.carry = undefined;
      rows.parseLines(last, 0, last.length);
    }
    const samples = rows.count;
    if (samples === 0) {
      throw new CaptureImportError(`header only: no data rows after the header on line ${this.headerLine}`);
    }
    if (samples < MIN_SAMPLES) {
      throw new CaptureImportError(`only ${samples} sample${samples === 1 ? "" : "s"}; at least ${MIN_SAMPLES} are needed for an analysis`);
    }
    let sampleRateHz: number;
    let startTimeS = 0;
    const timeColumn = this.columns.find((column) => column.kind === "time");
    if (timeColumn) {
      // The least-squares slope, not the end points: stamps printed with few digits scatter about the line.
      const fitted = rows.fittedIntervalInColumnUnit() * timeColumn.scaleToSi;
      sampleRateHz = fitted > 0 ? 1 / fitted : (samples - 1) / ((rows.lastTime - rows.firstTime) * timeColumn.scaleToSi);
      startTimeS = rows.firstTime * timeColumn.scaleToSi;
    } else {
      sampleRateHz = 1 / (this.preambleIntervalS as number);
    }
    // The row parser checks the first step; a span from near -MAX_VALUE to near +MAX_VALUE can still overflow.
    if (!(sampleRateHz > 0 && sampleRateHz < Infinity)) {
      throw new CaptureImportError(`the time column gives a sample rate of ${sampleRateHz} Hz; it must be a positive finite number`);
    }
    const voltageColumns = this.columns.filter((column) => column.kind === "voltage");
    const channels = voltageColumns.map((column, k) => {
      const stored = rows.channels[k];
      // Trim a generous first guess so the capture does not pin much more memory than it holds.
      const samplesV = stored.length > samples * 1.25 ? stored.slice(0, samples) : stored.subarray(0, samples);
      return { name: column.name, header: column.header, samples: samplesV };
    });
    return {
      metadata: this.metadata,
      columns: this.columns,
      channels,
      samples,
      sampleRateHz,
      startTimeS,
      timeSource: timeColumn ? "time-column" : "preamble",
      delimiter: this.delimiter,
      headerLine: this.headerLine,
    };
  }

  private appendHead(bytes: Uint8Array): void {
    if (CONTROL_CHARACTER.test(this.headDecoder.decode(bytes.subarray(0, 4096), { stream: false }))) {
      throw new CaptureImportError("binary content: the file holds control bytes, so it is not a text CSV capture");
    }
    if (this.headLength + bytes.length > this.head.length) {
      const grown = new Uint8Array(Math.max(this.head.length * 2, this.headLength + bytes.length));
      grown.set(this.head.subarray(0, this.headLength));
      this.head = grown;
    }
    this.head.set(bytes, this.headLength);
    this.headLength += bytes.length;
  }

  private decodeHeadLine(start: number, end: number): string {
    const text = this.headDecoder.decode(this.head.subarray(start, end));
    return text.endsWith("\r") ? text.slice(0, -1) : text;
  }

  /**
   * Records the head line from `start` to `textEnd` (`end` just past its line feed, if any); when it is the
   * first numeric line, decides the header and returns true.
   */
  private takeHeadLine(start: number, textEnd: number, end: number): boolean {
    const line: HeadLine = { text: this.decodeHeadLine(start, textEnd), lineNumber: this.headLines.length + 1, end };
    this.headLines.push(line);
    this.headScanned = end;
    if (line.text.trim() === "" || !isNumericLine(line.text)) return false;
    this.decide(this.headLines.length - 1);
    return true;
  }

  private scanHead(final: boolean): void {
    let start = this.headScanned;
    for (;;) {
      const newline = this.head.subarray(0, this.headLength).indexOf(LF, start);
      if (newline < 0) break;
      if (this.takeHeadLine(start, newline, newline + 1)) return;
      start = newline + 1;
    }
    if (final) {
      if (start < this.headLength && this.takeHeadLine(start, this.headLength, this.headLength)) return;
      this.decideWithoutNumbers();
      return;
    }
    if (this.headLength > HEAD_LIMIT_BYTES) {
      throw new CaptureImportError("no numeric data rows in the first 1 MB; is this a capture CSV?");
    }
  }

  /** The head holds its first numeric line at `firstDataIndex`: pick the header and start the rows. */
  private decide(firstDataIndex: number): void {
    const lines = this.headLines;
    const firstData = lines[firstDataIndex];
    const dataCells = splitCells(firstData.text, guessDelimiter(firstData.text)).length;
    let headerIndex = -1;
    for (let i = firstDataIndex - 1; i >= 0; i--) {
      const text = lines[i].text;
      if (text.trim() === "") continue;
      if (headerIndex < 0) headerIndex = i;
      // A header that names its columns wins over the text lines after it: those are bad data rows.
      if (namesAColumn(text) && splitCells(text, guessDelimiter(text)).length === dataCells) {
        headerIndex = i;
        break;
      }
    }
    if (headerIndex < 0) {
      throw new CaptureImportError(
        "no header row: the first line already holds numbers; the first line must name the columns",
        firstData.lineNumber,
      );
    }
    this.start(headerIndex);
  }

  /** The whole file had no numeric line: find the header so the rows after it report themselves. */
  private decideWithoutNumbers(): void {
    const lines = this.headLines;
    let headerIndex = -1;
    for (let i = lines.length - 1; i >= 0; i--) {
      if (lines[i].text.trim() === "") continue;
      if (headerIndex < 0) headerIndex = i;
      if (namesAColumn(lines[i].text)) {
        headerIndex = i;
        break;
      }
    }
    if (headerIndex < 0) throw new CaptureImportError("empty file: no header row and no data");
    this.start(headerIndex);
  }

  private start(headerIndex: number): void {
    const lines = this.headLines;
    const header = lines[headerIndex];
    this.headerLine = header.lineNumber;
    const delimiter = guessDelimiter(header.text);
    for (const line of lines.slice(0, headerIndex)) {
      if (line.text.trim() === "") continue;
      const cells = splitCells(line.text, guessDelimiter(line.text));
      const key = cells[0] ?? "";
      if (key !== "" && !(key in this.metadata)) this.metadata[key] = cells.slice(1).filter((c) => c !== "").join(" ");
    }
    const cells = (Papa.parse<string[]>(header.text, { delimiter, quoteChar: '"' }).data[0] ?? []).map((c) => c.trim());
    this.columns = cells.map((cell) =>
      cell === ""
        ? { header: "", name: "", unit: "", kind: "other" as const, scaleToSi: 1 }
        : parseColumnHeader(cell, header.lineNumber),
    );
    // A single-column file has no delimiter in its header: take the preamble's, else the data's.
    const firstData = lines.slice(headerIndex + 1).find((line) => line.text.trim() !== "");
    const preambleDelimiter = lines
      .slice(0, headerIndex)
      .map((line) => guessDelimiter(line.text))
      .find((guess) => guess !== ",");
    if (cells.length > 1) this.delimiter = delimiter;
    else this.delimiter = preambleDelimiter ?? (firstData ? guessDelimiter(firstData.text) : ",");
    const timeIndex = this.columns.findIndex((column) => column.kind === "time");
    const roles: number[] = [];
    const scales: number[] = [];
    let channel = 0;
    this.columns.forEach((column, index) => {
      if (index === timeIndex) roles.push(ROLE_TIME);
      else if (column.kind === "voltage") roles.push(channel++);
      else roles.push(ROLE_SKIP);
      scales.push(column.scaleToSi);
    });
    if (channel === 0) {
      throw new CaptureImportError(
        `no voltage column in the header '${header.text.trim()}': name a column with a unit of V or mV`,
        header.lineNumber,
      );
    }
    if (timeIndex < 0) {
      const timing = findPreambleTiming(this.metadata);
      if (!timing) {
        throw new CaptureImportError(
          "no time column (a header named 'time' or 't') and no sample interval or sample rate in the preamble",
        );
      }
      const intervalS = timing.sampleIntervalS;
      const rateHz = 1 / intervalS;
      if (!(rateHz > 0 && rateHz < Infinity)) {
        const line = lines.slice(0, headerIndex).find((l) => splitCells(l.text, guessDelimiter(l.text))[0] === timing.key);
        throw new CaptureImportError(
          `'${timing.key}' gives a sample interval of ${intervalS} s, too ${rateHz > 0 ? "small to give a finite" : "large to give a non-zero"} sample rate`,
          line?.lineNumber,
        );
      }
      this.preambleIntervalS = intervalS;
    }
    const dataStart = header.end;
    this.dataStartBytes = dataStart;
    let capacity = 1 << 16;
    if (this.sizeHintBytes !== undefined && firstData) {
      const rowBytes = Math.max(4, new TextEncoder().encode(firstData.text).length + 1);
      capacity = Math.max(MIN_SAMPLES, Math.ceil(((this.sizeHintBytes - dataStart) / rowBytes) * 1.15) + 64);
    }
    this.rows = new RowParser(
      roles,
      scales,
      this.columns.map((column) => column.header),
      this.delimiter,
      this.delimiter !== ",",
      header.lineNumber,
      capacity,
      { shared: this.sharedMemory },
    );
    const rest = this.head.slice(dataStart, this.headLength);
    this.head = new Uint8Array(0);
    this.headLines = [];
    if (rest.length > 0) this.pushData(rest, 0);
  }

  private pushData(chunk: Uint8Array, offset: number): void {
    const rows = this.rows as RowParser;
    let start = offset;
    if (this.carry) {
      const newline = chunk.indexOf(LF, start);
      if (newline < 0) {
        this.carry = concatBytes(this.carry, chunk.subarray(start));
        if (this.carry.length > LINE_LIMIT_BYTES) {
          throw new CaptureImportError("the line is longer than 1 MB; is this a capture CSV?", rows.lineNumber + 1);
        }
        return;
      }
      const joined = concatBytes(this.carry, chunk.subarray(start, newline + 1));
      this.carry = undefined;
      rows.parseLines(joined, 0, joined.length);
      start = newline + 1;
    }
    const last = chunk.lastIndexOf(LF);
    if (last >= start) {
      rows.parseLines(chunk, start, last + 1);
      start = last + 1;
    }
    if (start < chunk.length) this.carry = chunk.slice(start);
  }
}

/**
 * Reads a whole capture CSV held in memory (or given as chunks).
 *
 * @param input - the file's bytes, an iterable of chunks, or (for tests and small files) its text
 * @param options - see {@link CaptureImportOptions}
 * @returns the capture; see {@link CaptureImporter} for the accepted format
 * @throws CaptureImportError naming the problem, and the line for a bad row
 */
export function importCapture(
  input: Uint8Array | Iterable<Uint8Array> | string,
  options: CaptureImportOptions = {},
): Capture {
  const importer = new CaptureImporter(options);
  if (typeof input === "string") importer.push(new TextEncoder().encode(input));
  else if (input instanceof Uint8Array) importer.push(input);
  else for (const chunk of input) importer.push(chunk);
  return importer.finish();
}
