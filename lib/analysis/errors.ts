/**
 * A capture file that cannot be analysed, with a one-line message a technician can act on.
 *
 * Thrown by {@link importCapture} and {@link CaptureImporter} for every rejected input (empty file,
 * header only, too few samples, a non-numeric value, binary content, irregular or non-increasing
 * time, unknown units) and by {@link analyzeCapture} for a channel name that is not in the file.
 * Any other exception escaping the engine is a bug, not bad input.
 */
export class CaptureImportError extends Error {
  /** 1-based line number in the file of the offending row, when the problem is on one row. */
  readonly line?: number;

  /**
   * @param message - one line naming the problem; it is prefixed with `line N: ` when `line` is given
   * @param line - 1-based line number of the offending row
   */
  constructor(message: string, line?: number) {
    super(line === undefined ? message : `line ${line}: ${message}`);
    this.name = "CaptureImportError";
    if (line !== undefined) this.line = line;
  }
}
