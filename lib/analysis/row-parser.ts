import Papa from "papaparse";
import { CaptureImportError } from "./errors";

/** What the importer does with each column of a data row. */
export const ROLE_SKIP = -1;
export const ROLE_TIME = -2;

const COMMA = 0x2c;
const DOT = 0x2e;

// Exact powers of ten: a mantissa below 2^53 times or divided by one of these is correctly rounded
// (one IEEE operation on exact operands), so the fast path returns the same double as Number().
// Anything else (more digits, huge exponents) goes through Number() itself.
const POW10 = Array.from({ length: 23 }, (_, i) => Number(`1e${i}`));

/** Control characters that never appear in a text CSV (tab, LF, FF and CR are allowed). */
export const CONTROL_CHARACTER = /[\u0000-\u0008\u000b\u000e-\u001f\u007f]/;
/** Same grammar as the fast path, for rows that take the slow path. */
const NUMBER_TEXT = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * The largest voltage magnitude a capture may hold, in volts. No scope input reaches a gigavolt, and far below
 * the ~1e150 V where the engine's power sums overflow (a sine near 1e200 V is read at a wrong frequency without
 * any error), so a bigger value is a broken file, refused with its line and column.
 */
export const MAX_ABS_VOLTS = 1e9;

function growTo(array: Float64Array, capacity: number, shared: boolean): Float64Array {
  const grown = newSamples(capacity, shared);
  grown.set(array);
  return grown;
}

function newSamples(length: number, shared: boolean): Float64Array {
  return shared ? new Float64Array(new SharedArrayBuffer(length * 8)) : new Float64Array(length);
}

/** How a data row is laid out: what {@link RowParser} needs besides its position in the file. */
export interface RowLayout {
  /** Per column: ROLE_TIME, ROLE_SKIP or the index of the channel it fills. */
  roles: number[];
  /** Per column: factor from the file's number to volts (channels only). */
  scales: number[];
  /** Per column: the header cell, for messages. */
  columnHeaders: string[];
  /** `,`, `;` or a tab. */
  delimiter: string;
  /** Whether `,` may be the decimal mark (never with a comma delimiter). */
  decimalComma: boolean;
}

/** Options for {@link RowParser} beyond the layout. */
export interface RowParserOptions {
  /** Keep the samples in SharedArrayBuffers, so another thread can read them without a copy. */
  shared?: boolean;
  /** Arrays to fill first (for example a stretch of another parser's shared arrays); grown by copying when full. */
  channels?: Float64Array[];
  /**
   * Parse a stretch of rows that does not start the record: keep every stamp (and where its printed
   * precision changes) instead of checking the spacing, for {@link RowParser.appendRows} of the
   * parser that holds the rows before it.
   */
  keepTimes?: boolean;
}

/** Rows a `keepTimes` parser read: the channels, the stamps and the lines they took. */
export interface ParsedRows {
  count: number;
  /** Lines consumed, blank ones included. */
  lines: number;
  /** Per channel, `count` samples in volts. */
  channels: Float64Array[];
  /** `count` stamps in the time column's unit (empty without a time column). */
  times: Float64Array;
  /** Pairs (row, printed precision of the stamps from that row on). */
  quantumRuns: number[];
}

/**
 * Parses the data rows of a capture from bytes into typed arrays, without building a string or an
 * object per row. Each region handed to {@link RowParser.parseLines} must end just after a line feed.
 *
 * The fast path reads numbers straight from the bytes; a row it cannot read (quotes around a
 * delimiter, extra trailing cells, a blank line made of spaces, a bad value) is decoded and handled
 * by the slow path, which also produces the error message.
 */
export class RowParser {
  /** Rows stored so far. */
  count = 0;
  /** 1-based number of the last line consumed. */
  lineNumber: number;
  // The double-valued fields start at -0 (which sums and comparisons treat as 0) rather than 0: a
  // field first set to a small integer is laid out as one, and the first double stored into it
  // changes the object's shape under the optimised parser, which then falls back to the interpreter.
  firstTime = -0;
  lastTime = -0;
  /**
   * Sums for the least-squares line t = t₀ + i·Δt through every stamp (i the row index, t taken from
   * the first stamp): Σi, Σt, Σi², Σi·t. Rounded stamps scatter about the line, which averages the
   * rounding out where the end points alone would keep it.
   */
  private sumI = -0;
  private sumT = -0;
  private sumII = -0;
  private sumIT = -0;
  /** Printed precision of the last stamp: one unit of its last digit, in the column's own unit. */
  private lastQuantum = -0;
  private readonly roles: Int32Array;
  private readonly scales: Float64Array;
  private readonly columnHeaders: string[];
  private readonly delimiter: number;
  private readonly decimalComma: boolean;
  private readonly hasTime: boolean;
  /** Factor from the time column's number to seconds (1 without a time column). */
  private readonly timeScale: number;
  private capacity: number;
  /** One growing array per stored channel, in channel order. */
  channels: Float64Array[];
  private readonly shared: boolean;
  private readonly keepTimes: boolean;
  /** The stamps of a `keepTimes` parser. */
  private times: Float64Array;
  private readonly quantumRuns: number[] = [];
  private warmedUp = false;
  private readonly decoder = new TextDecoder("utf-8");

  /**
   * @param roles - per column: ROLE_TIME, ROLE_SKIP or the index of the channel it fills
   * @param scales - per column: factor from the file's number to volts (channels only)
   * @param columnHeaders - per column: the header cell, for messages
   * @param delimiter - `,`, `;` or a tab
   * @param decimalComma - whether `,` may be the decimal mark (never with a comma delimiter)
   * @param headerLineNumber - 1-based line of the header row
   * @param initialCapacity - rows to allocate up front (a good guess avoids regrowing)
   */
  constructor(
    roles: number[],
    scales: number[],
    columnHeaders: string[],
    delimiter: string,
    decimalComma: boolean,
    headerLineNumber: number,
    initialCapacity: number,
    options: RowParserOptions = {},
  ) {
    this.roles = Int32Array.from(roles);
    this.scales = Float64Array.from(scales);
    this.columnHeaders = columnHeaders;
    this.delimiter = delimiter.charCodeAt(0);
    this.decimalComma = decimalComma && delimiter !== ",";
    this.hasTime = roles.includes(ROLE_TIME);
    this.timeScale = this.hasTime ? scales[roles.indexOf(ROLE_TIME)] : 1;
    this.lineNumber = headerLineNumber;
    const channelCount = roles.reduce((n, role) => (role >= 0 ? n + 1 : n), 0);
    this.shared = options.shared === true;
    this.keepTimes = options.keepTimes === true && this.hasTime;
    if (options.channels && options.channels.length === channelCount && channelCount > 0) {
      this.capacity = Math.min(...options.channels.map((c) => c.length));
      this.channels = [...options.channels];
    } else {
      this.capacity = Math.max(64, Math.ceil(initialCapacity));
      this.channels = Array.from({ length: channelCount }, () => newSamples(this.capacity, this.shared));
    }
    this.times = new Float64Array(this.keepTimes ? this.capacity : 0);
  }

  /** The layout this parser reads, for a parser of a later stretch of the same rows. */
  layout(): RowLayout {
    return {
      roles: Array.from(this.roles),
      scales: Array.from(this.scales),
      columnHeaders: this.columnHeaders,
      delimiter: String.fromCharCode(this.delimiter),
      decimalComma: this.decimalComma,
    };
  }

  /**
   * Takes over the rows a `keepTimes` parser read from the lines right after the last one parsed
   * here, checking their stamps' spacing and adding them to the time-base sums in order, exactly
   * as parsing them here would.
   *
   * @returns false, with nothing changed, when a stamp fails a check or this parser holds fewer
   *   than two rows: the caller then parses those lines here, which words the error
   */
  appendRows(rows: ParsedRows): boolean {
    const n = rows.count;
    if (this.hasTime && n > 0) {
      if (this.count < 2 || rows.times.length < n) return false;
      const maxSpacingError = 0.01;
      const times = rows.times;
      const runs = rows.quantumRuns;
      const firstTime = this.firstTime;
      let count = this.count;
      let previousTime = this.lastTime;
      let previousQuantum = this.lastQuantum;
      let timeQuantum = previousQuantum;
      let run = 0;
      let sumI = this.sumI;
      let sumT = this.sumT;
      let sumII = this.sumII;
      let sumIT = this.sumIT;
      // The same checks and sums, term for term, as the parse loop's for rows after the second.
      for (let r = 0; r < n; r++) {
        if (run < runs.length && runs[run] === r) {
          timeQuantum = runs[run + 1];
          run += 2;
        }
        const time = times[r];
        const spacing = time - previousTime;
        const slack = 0.5 * (timeQuantum + previousQuantum);
        const expected = (previousTime - firstTime) / (count - 1);
        if (!(spacing > 0) && !(spacing > -slack && expected <= 2 * slack)) return false;
        if (Math.abs(spacing - expected) > maxSpacingError * expected + slack) return false;
        const t = time - firstTime;
        const i = count + -0;
        sumI += i;
        sumT += t;
        sumII += i * i;
        sumIT += i * t;
        previousTime = time;
        previousQuantum = timeQuantum;
        count++;
      }
      this.sumI = sumI;
      this.sumT = sumT;
      this.sumII = sumII;
      this.sumIT = sumIT;
      this.lastQuantum = previousQuantum;
      this.lastTime = previousTime;
    }
    const total = this.count + n;
    for (let k = 0; k < this.channels.length; k++) {
      const own = this.channels[k];
      const theirs = rows.channels[k].subarray(0, n);
      const buffer = own.buffer;
      // Rows parsed into a later stretch of this parser's own buffer move down in place.
      if (theirs.buffer === buffer && theirs.byteOffset >= own.byteOffset + this.count * 8) {
        const whole = new Float64Array(buffer, own.byteOffset, (buffer.byteLength - own.byteOffset) / 8);
        whole.copyWithin(this.count, (theirs.byteOffset - own.byteOffset) / 8, (theirs.byteOffset - own.byteOffset) / 8 + n);
        this.channels[k] = whole;
      } else {
        const grown = own.length >= total ? own : growTo(own.subarray(0, this.count), total, this.shared);
        grown.set(theirs, this.count);
        this.channels[k] = grown;
      }
    }
    this.capacity = Math.min(...this.channels.map((c) => c.length));
    this.count = total;
    this.lineNumber += rows.lines;
    return true;
  }

  /** What a `keepTimes` parser has read so far. */
  parsedRows(): ParsedRows {
    return {
      count: this.count,
      lines: this.lineNumber,
      channels: this.channels.map((c) => c.subarray(0, this.count)),
      times: this.times.subarray(0, this.keepTimes ? this.count : 0),
      quantumRuns: this.quantumRuns,
    };
  }

  /**
   * Gives up the arrays' room from row `firstRow` on (for a parser of a later stretch to fill) and
   * keeps the rows before it; undefined when this parser already holds that many rows.
   */
  releaseTail(firstRow: number): Float64Array[] | undefined {
    if (!(firstRow > this.count + 64) || !(firstRow < this.capacity - 64)) return undefined;
    const tails = this.channels.map((c) => c.subarray(firstRow));
    this.channels = this.channels.map((c) => c.subarray(0, firstRow));
    this.capacity = firstRow;
    return tails;
  }

  /** Parses every line in `bytes[start, end)`; `bytes[end - 1]` must be a line feed. */
  parseLines(bytes: Uint8Array, start: number, end: number): void {
    // The first call parses one line on its own, in the interpreter, so every statement of the
    // loop and of what follows it has run once before the optimising compiler builds code for the
    // loop: code built earlier stopped at the first statement it had not seen run (the stores of
    // the state after the loop), and every 1 MB chunk then started interpreted again (11
    // deoptimisations in a 1M-row file). Lines are independent, so the split changes nothing.
    if (!this.warmedUp) {
      this.warmedUp = true;
      const firstEnd = bytes.indexOf(0x0a, start) + 1;
      if (firstEnd > start && firstEnd < end) {
        this.parseRegion(bytes, start, firstEnd);
        start = firstEnd;
      }
    }
    this.parseRegion(bytes, start, end);
  }

  private parseRegion(bytes: Uint8Array, start: number, end: number): void {
    // Byte values and tables as locals: module constants read inside a hot loop pay a
    // temporal-dead-zone check on every access, which costs more than the parsing itself.
    const LF = 0x0a;
    const CR = 0x0d;
    const SPACE = 0x20;
    const TAB = 0x09;
    const QUOTE = 0x22;
    const PLUS = 0x2b;
    const MINUS = 0x2d;
    const DOT = 0x2e;
    const COMMA = 0x2c;
    const ZERO = 0x30;
    const LOWER_E = 0x65;
    const UPPER_E = 0x45;
    const SKIP = -1;
    const TIME = -2;
    const pow10 = POW10;
    const maxExactMantissa = Number.MAX_SAFE_INTEGER;
    const maxSpacingError = 0.01;
    const maxAbsVolts = MAX_ABS_VOLTS;
    const roles = this.roles;
    const scales = this.scales;
    const columnCount = roles.length;
    const delimiter = this.delimiter;
    const decimalComma = this.decimalComma;
    const skipTabs = delimiter !== TAB;
    const hasTime = this.hasTime;
    const keepTimes = this.keepTimes;
    const quantumRuns = this.quantumRuns;
    let times = this.times;
    let channels = this.channels;
    let count = this.count;
    let line = this.lineNumber;
    let previousTime = this.lastTime;
    let previousQuantum = this.lastQuantum;
    let timeQuantum = 0;
    let sumI = this.sumI;
    let sumT = this.sumT;
    let sumII = this.sumII;
    let sumIT = this.sumIT;
    let pos = start;

    while (pos < end) {
      const lineStart = pos;
      line++;
      let c = bytes[pos];
      if (c === LF) {
        pos++;
        continue;
      }
      if (c === CR && bytes[pos + 1] === LF) {
        pos += 2;
        continue;
      }
      if (count === this.capacity) {
        this.capacity = Math.ceil(this.capacity * 1.5);
        for (let k = 0; k < channels.length; k++) channels[k] = growTo(channels[k], this.capacity, this.shared);
        if (keepTimes) this.times = times = growTo(times, this.capacity, false);
      }
      let column = 0;
      let time = 0;
      let fast = true;
      // Fields of one row.
      for (;;) {
        c = bytes[pos];
        while (c === SPACE || (c === TAB && skipTabs)) c = bytes[++pos];
        const role = column < columnCount ? roles[column] : SKIP;
        if (role === SKIP && column < columnCount) {
          // A column we do not keep: step over it without reading it.
          let quoted = false;
          while (c !== LF && ((c !== delimiter && c !== CR) || quoted)) {
            if (c === QUOTE) quoted = !quoted;
            c = bytes[++pos];
          }
        } else {
          if (column >= columnCount) {
            fast = false;
            break;
          }
          let quoted = false;
          if (c === QUOTE) {
            quoted = true;
            c = bytes[++pos];
          }
          const numberStart = pos;
          let negative = false;
          if (c === MINUS) {
            negative = true;
            c = bytes[++pos];
          } else if (c === PLUS) {
            c = bytes[++pos];
          }
          // -0, not 0: arithmetic seeded with a small integer is compiled as integer arithmetic, and
          // the first mantissa past 2^30 (a 10-digit time stamp) would throw the optimised code away.
          let mantissa = -0;
          let scale10 = 0;
          // A stamp printed without a decimal point or exponent is taken as exact (a writer printing its full value).
          let printedFraction = false;
          const integerStart = pos;
          let d = c - ZERO;
          while (d >= 0 && d <= 9) {
            mantissa = mantissa * 10 + d;
            d = bytes[++pos] - ZERO;
          }
          let digits = pos - integerStart;
          c = bytes[pos];
          if (c === DOT || (c === COMMA && decimalComma)) {
            printedFraction = true;
            const fractionStart = ++pos;
            d = bytes[pos] - ZERO;
            while (d >= 0 && d <= 9) {
              mantissa = mantissa * 10 + d;
              d = bytes[++pos] - ZERO;
            }
            scale10 = fractionStart - pos;
            digits -= scale10;
            c = bytes[pos];
          }
          if (digits === 0) {
            fast = false;
            break;
          }
          if (c === LOWER_E || c === UPPER_E) {
            printedFraction = true;
            c = bytes[++pos];
            let exponentNegative = false;
            if (c === MINUS) {
              exponentNegative = true;
              c = bytes[++pos];
            } else if (c === PLUS) {
              c = bytes[++pos];
            }
            let exponent = 0;
            let exponentDigits = 0;
            d = c - ZERO;
            while (d >= 0 && d <= 9) {
              exponent = exponent * 10 + d;
              exponentDigits++;
              d = bytes[++pos] - ZERO;
            }
            if (exponentDigits === 0) {
              fast = false;
              break;
            }
            scale10 += exponentNegative ? -exponent : exponent;
            c = bytes[pos];
          }
          let value: number;
          // Every partial mantissa was below the final one, so if that is below 2^53 all were exact.
          if (mantissa <= maxExactMantissa && scale10 >= -22 && scale10 <= 22) {
            value = scale10 >= 0 ? mantissa * pow10[scale10] : mantissa / pow10[-scale10];
            if (negative) value = -value;
          } else {
            value = this.slowNumber(bytes, numberStart, pos);
            if (!Number.isFinite(value)) {
              fast = false;
              break;
            }
          }
          if (quoted) {
            if (c !== QUOTE) {
              fast = false;
              break;
            }
            c = bytes[++pos];
          }
          while (c === SPACE || (c === TAB && skipTabs)) c = bytes[++pos];
          if (role === TIME) {
            time = value;
            timeQuantum = !printedFraction ? 0 : scale10 >= 0 ? pow10[scale10] : 1 / pow10[-scale10];
          } else {
            const volts = value * scales[column];
            // Out of bounds: let the slow path name the line and column.
            if (!(volts <= maxAbsVolts && volts >= -maxAbsVolts)) {
              fast = false;
              break;
            }
            channels[role][count] = volts;
          }
        }
        column++;
        if (c === delimiter) {
          pos++;
          continue;
        }
        if (c === LF || c === CR) break;
        fast = false;
        break;
      }
      if (fast && column === columnCount) {
        c = bytes[pos];
        if (c === CR) c = bytes[++pos];
        if (c !== LF) {
          fast = false;
        } else {
          pos++;
        }
      } else {
        fast = false;
      }
      if (!fast) {
        let lineEnd = lineStart;
        while (bytes[lineEnd] !== LF) lineEnd++;
        pos = lineEnd + 1;
        const text = this.decoder.decode(bytes.subarray(lineStart, lineEnd));
        const parsed = this.slowRow(text, line);
        if (parsed === undefined) continue;
        time = parsed.time;
        timeQuantum = parsed.timeQuantum;
        channels = this.channels;
        for (let k = 0; k < parsed.values.length; k++) channels[k][count] = parsed.values[k];
      }
      if (keepTimes) {
        times[count] = time;
        if (count === 0 || timeQuantum !== previousQuantum) quantumRuns.push(count, timeQuantum);
        previousTime = time;
        previousQuantum = timeQuantum;
      } else if (hasTime) {
        if (count === 0) {
          this.firstTime = time;
        } else {
          const spacing = time - previousTime;
          // Two stamps each rounded to half a unit of their last printed digit can differ from the
          // true step by up to the sum of those halves.
          const slack = 0.5 * (timeQuantum + previousQuantum);
          if (count === 1) {
            if (!(spacing > 0)) {
              this.rememberProgress(count, line, previousTime);
              throw new CaptureImportError(
                `time ${time} is not after the previous sample's ${previousTime}; time must be strictly increasing`,
                line,
              );
            }
            // A subnormal step (1e-310 s) is a positive double whose reciprocal overflows to Infinity, and a
            // step near the largest double has a reciprocal of 0: neither is a sample rate the engine can use.
            const intervalS = spacing * this.timeScale;
            const rateHz = 1 / intervalS;
            if (!(rateHz > 0 && rateHz < Infinity)) {
              throw new CaptureImportError(
                `sample interval ${intervalS} s is too ${rateHz > 0 ? "small to give a finite" : "large to give a non-zero"} sample rate`,
                line,
              );
            }
          } else {
            const expected = (previousTime - this.firstTime) / (count - 1);
            if (!(spacing > 0) && !(spacing > -slack && expected <= 2 * slack)) {
              this.rememberProgress(count, line, previousTime);
              throw new CaptureImportError(
                `time ${time} is not after the previous sample's ${previousTime}; time must be strictly increasing`,
                line,
              );
            }
            if (Math.abs(spacing - expected) > maxSpacingError * expected + slack) {
              this.rememberProgress(count, line, previousTime);
              throw new CaptureImportError(
                `sample spacing ${spacing} differs from the record's mean spacing ${expected.toPrecision(6)} by more than 1%` +
                  (slack > 0 ? ` plus the stamps' printed precision (±${slack.toPrecision(2)})` : "") +
                  ": a missing row or a restarted time base? The samples must be evenly spaced",
                line,
              );
            }
          }
          const t = time - this.firstTime;
          // The row index as a double (adding -0 changes no value): as integers, count² would
          // overflow 2^31 past row 46,340 and throw the optimised code away.
          const i = count + -0;
          sumI += i;
          sumT += t;
          sumII += i * i;
          sumIT += i * t;
        }
        previousTime = time;
        previousQuantum = timeQuantum;
      }
      count++;
    }
    this.sumI = sumI;
    this.sumT = sumT;
    this.sumII = sumII;
    this.sumIT = sumIT;
    this.lastQuantum = previousQuantum;
    this.rememberProgress(count, line, previousTime);
  }

  /**
   * Sample interval in the time column's unit from the least-squares line through every stamp
   * (the first stamp sits at i = 0, t = 0, so it enters the sums as zeros).
   */
  fittedIntervalInColumnUnit(): number {
    const n = this.count;
    if (n < 2) return Number.NaN;
    const meanI = this.sumI / n;
    const meanT = this.sumT / n;
    const sxx = this.sumII - n * meanI * meanI;
    const sxy = this.sumIT - n * meanI * meanT;
    return sxy / sxx;
  }

  private rememberProgress(count: number, line: number, lastTime: number): void {
    this.count = count;
    this.lineNumber = line;
    this.lastTime = lastTime;
  }

  /** Numbers with more than 15 significant digits or extreme exponents: let the engine round them. */
  private slowNumber(bytes: Uint8Array, start: number, end: number): number {
    let text = "";
    for (let i = start; i < end; i++) text += String.fromCharCode(bytes[i] === COMMA ? DOT : bytes[i]);
    return Number(text);
  }

  /**
   * Reads one row the fast path could not, or explains why it is bad.
   * @returns undefined for a blank line, else the time and the scaled channel values
   */
  private slowRow(text: string, line: number): { time: number; timeQuantum: number; values: number[] } | undefined {
    if (text.trim() === "") return undefined;
    if (CONTROL_CHARACTER.test(text)) {
      throw new CaptureImportError("binary content: control bytes in a data row, so this is not a text CSV", line);
    }
    const columnCount = this.roles.length;
    const delimiter = String.fromCharCode(this.delimiter);
    const cells = (Papa.parse<string[]>(text, { delimiter, quoteChar: '"' }).data[0] ?? [""]).map((cell) => cell.trim());
    while (cells.length > columnCount && cells[cells.length - 1] === "") cells.pop();
    // Columns with an empty header (a trailing delimiter on the header row) may be missing.
    while (cells.length < columnCount && this.columnHeaders[cells.length] === "") cells.push("");
    if (cells.length !== columnCount) {
      throw new CaptureImportError(
        `expected ${columnCount} value${columnCount === 1 ? "" : "s"} (one per header column), found ${cells.length}`,
        line,
      );
    }
    let time = 0;
    let timeQuantum = 0;
    const values: number[] = [];
    for (let column = 0; column < columnCount; column++) {
      const role = this.roles[column];
      if (role === ROLE_SKIP) continue;
      const cell = cells[column];
      const header = this.columnHeaders[column];
      if (cell === "") throw new CaptureImportError(`empty value in column ${header}`, line);
      const normalised = this.decimalComma ? cell.replace(",", ".") : cell;
      if (!NUMBER_TEXT.test(normalised)) {
        const shown = cell.length > 40 ? `${cell.slice(0, 40)}…` : cell;
        throw new CaptureImportError(`'${shown}' is not a number in column ${header}`, line);
      }
      const value = Number(normalised);
      if (!Number.isFinite(value)) throw new CaptureImportError(`'${cell}' is out of range in column ${header}`, line);
      if (role === ROLE_TIME) {
        time = value;
        timeQuantum = printedQuantum(normalised);
      } else {
        const volts = value * this.scales[column];
        if (!(Math.abs(volts) <= MAX_ABS_VOLTS)) {
          throw new CaptureImportError(
            `'${cell}' in column ${header} is beyond ±${MAX_ABS_VOLTS.toExponential().replace("+", "")} V, which is not a measurement a scope can make`,
            line,
          );
        }
        values[role] = volts;
      }
    }
    return { time, timeQuantum, values };
  }
}

/** One unit of the last printed digit of a number's text: "1.2340e-3" → 1e-7; 0 for a plain integer ("49"), taken as exact. */
function printedQuantum(text: string): number {
  const match = /^[+-]?(\d*)(?:\.(\d*))?(?:[eE]([+-]?\d+))?$/.exec(text.trim());
  if (!match || (match[2] === undefined && match[3] === undefined)) return 0;
  const decimals = match[2]?.length ?? 0;
  const exponent = match[3] ? Number(match[3]) : 0;
  return 10 ** (exponent - decimals);
}
