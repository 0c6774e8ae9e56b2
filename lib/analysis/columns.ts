import { CaptureImportError } from "./errors";

/** What a capture column holds, as read from its header cell. */
export type ColumnKind = "time" | "voltage" | "other";

/** One column of a capture's header row. */
export interface CaptureColumn {
  /** The header cell as written, trimmed. */
  header: string;
  /** The name without its unit, e.g. `Out` for `Out (mV)`. */
  name: string;
  /** The unit as written (`ms`, `mV`, …); empty when the header gives none. */
  unit: string;
  kind: ColumnKind;
  /** Factor from the file's numbers to SI (seconds or volts); 1 for `other` columns. */
  scaleToSi: number;
}

// A unit is the last bracketed group of the cell: "Out (mV)", "t[us]", "CH1 [V]".
const UNIT_PATTERN = /^(.*?)[([]\s*([^)\]]*?)\s*[)\]]\s*$/;

const TIME_SCALE: Record<string, number> = {
  "": 1,
  s: 1,
  sec: 1,
  ms: 1e-3,
  us: 1e-6,
  "\u00b5s": 1e-6, // micro sign
  "\u03bcs": 1e-6, // Greek small mu
  ns: 1e-9,
};

const VOLTAGE_SCALE: Record<string, number> = {
  "": 1,
  v: 1,
  mv: 1e-3,
  uv: 1e-6,
  "\u00b5v": 1e-6,
  "\u03bcv": 1e-6,
  kv: 1e3,
};

/**
 * Reads one header cell into a column description.
 *
 * A cell is a time column when its name contains "time" or is a bare "t" (any case); its unit must
 * then be s, ms, us, µs or ns (none means seconds). Otherwise it is a voltage column when its unit
 * is V or mV (also µV/uV/kV), or when it has no unit at all; any other unit makes it `other`.
 *
 * @param header - the header cell text (quotes already removed)
 * @param lineNumber - 1-based line of the header row, for the error message
 * @returns the column description with its scale to SI units
 * @throws CaptureImportError when a time column carries a unit that is not a time unit
 */
export function parseColumnHeader(header: string, lineNumber: number): CaptureColumn {
  const cell = header.trim();
  const match = UNIT_PATTERN.exec(cell);
  const name = (match ? match[1] : cell).trim();
  const unit = match ? match[2] : "";
  const lowerName = name.toLowerCase();
  if (lowerName === "t" || lowerName.includes("time")) {
    const scale = TIME_SCALE[unit.toLowerCase()] ?? TIME_SCALE[unit];
    if (scale === undefined) {
      throw new CaptureImportError(`unknown time unit '${unit}' in column ${cell}; use s, ms, us, µs or ns`, lineNumber);
    }
    return { header: cell, name, unit, kind: "time", scaleToSi: scale };
  }
  // "MV" would be megavolts; no scope exports that, and reading it as millivolts would be worse.
  const voltageScale = unit === "MV" ? undefined : VOLTAGE_SCALE[unit.toLowerCase()];
  if (voltageScale !== undefined && name !== "") {
    return { header: cell, name, unit, kind: "voltage", scaleToSi: voltageScale };
  }
  return { header: cell, name, unit, kind: "other", scaleToSi: 1 };
}
