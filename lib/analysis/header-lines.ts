import Papa from "papaparse";
import { parseColumnHeader } from "./columns";

/**
 * How the lines before a capture's data are read: shared by the importer and by the upload form's preview of
 * the channels (lib/capture-sniff), so the form offers exactly what the worker will accept.
 */

export type CaptureDelimiter = "," | ";" | "\t";

const NUMERIC_CELL = /^[+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?$/;

/** A tab anywhere means tab-separated, else a semicolon means semicolon-separated (decimal commas), else comma. */
export function guessDelimiter(text: string): CaptureDelimiter {
  if (text.includes("\t")) return "\t";
  if (text.includes(";")) return ";";
  return ",";
}

/** The line's cells, trimmed, quotes honoured, trailing empty cells dropped. */
export function splitCells(text: string, delimiter: CaptureDelimiter): string[] {
  const cells = (Papa.parse<string[]>(text, { delimiter, quoteChar: '"' }).data[0] ?? []).map((cell) => cell.trim());
  while (cells.length > 1 && cells[cells.length - 1] === "") cells.pop();
  return cells;
}

/** Whether the line is a data row: every cell a number (decimal commas allowed unless the delimiter is a comma). */
export function isNumericLine(text: string): boolean {
  const delimiter = guessDelimiter(text);
  const cells = text.split(delimiter).map((cell) => cell.trim().replace(/^"(.*)"$/, "$1"));
  while (cells.length > 1 && cells[cells.length - 1] === "") cells.pop();
  if (cells.length === 0 || cells[0] === "") return false;
  return cells.every((cell) => NUMERIC_CELL.test(cell) && (delimiter !== "," || !cell.includes(",")));
}

/** Whether the line names at least one column the importer recognises (a time column, or a voltage with a unit). */
export function namesAColumn(text: string): boolean {
  return splitCells(text, guessDelimiter(text)).some((cell) => {
    try {
      const column = parseColumnHeader(cell, 0);
      return column.kind === "time" || (column.kind === "voltage" && column.unit !== "");
    } catch {
      return true; // a time column with an odd unit is still a header
    }
  });
}
