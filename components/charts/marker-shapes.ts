/**
 * Filled marker shapes drawn on a chart's canvas, so a series is told apart by shape as well as colour (a reader
 * who cannot tell the colours apart, or a print in grey, still can).
 */
export type MarkerShape = "circle" | "square" | "triangle" | "diamond";

/** The glyph that stands for each shape in a legend or a table. */
export const MARKER_GLYPHS: Record<MarkerShape, string> = { circle: "●", square: "■", triangle: "▲", diamond: "◆" };

/** Draws one marker centred on (x, y) with radius r in canvas pixels, filled and stroked with the context's styles. */
export function drawMarker(ctx: CanvasRenderingContext2D, shape: MarkerShape, x: number, y: number, r: number): void {
  ctx.beginPath();
  if (shape === "circle") ctx.arc(x, y, r, 0, 2 * Math.PI);
  else if (shape === "square") ctx.rect(x - r, y - r, 2 * r, 2 * r);
  else if (shape === "triangle") {
    ctx.moveTo(x, y - r * 1.2);
    ctx.lineTo(x + r * 1.1, y + r * 0.9);
    ctx.lineTo(x - r * 1.1, y + r * 0.9);
    ctx.closePath();
  } else {
    ctx.moveTo(x, y - r * 1.3);
    ctx.lineTo(x + r * 1.1, y);
    ctx.lineTo(x, y + r * 1.3);
    ctx.lineTo(x - r * 1.1, y);
    ctx.closePath();
  }
  ctx.fill();
  ctx.stroke();
}
