import { DASH, formatPercent, formatSignedPicofarads } from "@/lib/format";

/** An unsigned spread in picofarads with one decimal ("1.5 pF"); a dash when missing. */
export function picofaradSpread(valueF: number | null | undefined): string {
  if (typeof valueF !== "number" || !Number.isFinite(valueF)) return DASH;
  return `${(Math.abs(valueF) * 1e12).toFixed(1)} pF`;
}

/** A signed capacitance figure in picofarads ("+12.3 pF"). */
export function picofaradFigure(valueF: number | null | undefined): string {
  return formatSignedPicofarads(valueF, 1);
}

/** A fractional inductance error as a signed percentage ("−0.42 %"). */
export function inductanceErrorText(fraction: number | null | undefined): string {
  return typeof fraction === "number" && Number.isFinite(fraction) ? formatPercent(fraction * 100, 2, { signed: true }) : DASH;
}
