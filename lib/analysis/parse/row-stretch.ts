import { CaptureImportError } from "../errors";
import { type ParsedRows, type RowLayout, RowParser } from "../row-parser";

const LF = 0x0a;
const LINE_LIMIT_BYTES = 1 << 20;

/** Options for {@link parseRowStretch}. */
export interface RowStretchOptions {
  /** Arrays to fill first (from {@link CaptureImporter.releaseTail}); grown elsewhere when full. */
  channels?: Float64Array[];
  /** Rows to allocate when no arrays are given. */
  capacity?: number;
}

/**
 * Parses a stretch of a capture's data rows that starts at the beginning of a line and runs to the
 * end of the file, given as chunks in order, for {@link CaptureImporter.pushParsedRows} of the
 * importer that read the rows before it. This lets a command parse the two halves of a large file
 * on two threads.
 *
 * It refuses what the importer refuses, but does not word it: a bad row, an overlong line, or
 * anything else odd gives undefined, and the caller pushes the stretch's bytes through the importer
 * itself, which reports the problem with its exact message and line number.
 *
 * @param layout - from {@link CaptureImporter.rowLayout}
 * @param chunks - the stretch's bytes; the last line may lack its line feed
 * @returns the rows, or undefined when the importer must read the stretch itself
 */
export function parseRowStretch(layout: RowLayout, chunks: Iterable<Uint8Array>, options: RowStretchOptions = {}): ParsedRows | undefined {
  const parser = new RowParser(layout.roles, layout.scales, layout.columnHeaders, layout.delimiter, layout.decimalComma, 0, options.capacity ?? 1 << 16, {
    shared: true,
    keepTimes: true,
    channels: options.channels,
  });
  let carry: Uint8Array | undefined;
  try {
    for (const chunk of chunks) {
      let start = 0;
      if (carry) {
        const newline = chunk.indexOf(LF);
        if (newline < 0) {
          carry = join(carry, chunk);
          if (carry.length > LINE_LIMIT_BYTES) return undefined;
          continue;
        }
        const line = join(carry, chunk.subarray(0, newline + 1));
        carry = undefined;
        parser.parseLines(line, 0, line.length);
        start = newline + 1;
      }
      const last = chunk.lastIndexOf(LF);
      if (last >= start) {
        parser.parseLines(chunk, start, last + 1);
        start = last + 1;
      }
      // Copied: the caller may reuse the chunk's buffer for the next read.
      if (start < chunk.length) carry = chunk.slice(start);
    }
    if (carry && carry.length > 0) {
      const line = join(carry, Uint8Array.of(LF));
      parser.parseLines(line, 0, line.length);
    }
  } catch (error) {
    if (error instanceof CaptureImportError) return undefined;
    throw error;
  }
  return parser.parsedRows();
}

function join(a: Uint8Array, b: Uint8Array): Uint8Array {
  const joined = new Uint8Array(a.length + b.length);
  joined.set(a, 0);
  joined.set(b, a.length);
  return joined;
}
