"use client";

import { useCallback, useEffect, useId, useRef, useState, type KeyboardEvent, type ReactNode } from "react";
import uPlot from "uplot";
import "uplot/dist/uPlot.min.css";
import { cn } from "@/lib/utils";

export interface UPlotChartProps {
  /** Options without width and height; the chart fills its container's width. */
  options: Omit<uPlot.Options, "width" | "height">;
  data: uPlot.AlignedData;
  /** Plot height in CSS pixels. */
  height?: number;
  /** What the chart shows, for screen readers and the focus ring's label. */
  label: string;
  /** The cursor readout for a data index (null when the cursor is off the plot). */
  readout: (index: number | null) => ReactNode;
  /** Extra legend content under the plot. */
  legend?: ReactNode;
  className?: string;
}

/** Share of the visible x range one arrow-key press moves the cursor (Shift: ten times as far). */
const STEP_FRACTION = 0.01;
const ZOOM_FACTOR = 0.5;

/**
 * A uPlot chart that fills its container: drag across the plot to zoom, double-click or "Reset" to zoom out,
 * and a cursor readout in our own formatting. From the keyboard: focus the plot, then ← → move the cursor,
 * + and − zoom around it, 0 resets.
 */
export function UPlotChart({ options, data, height = 260, label, readout, legend, className }: UPlotChartProps) {
  const plotRef = useRef<HTMLDivElement>(null);
  const chartRef = useRef<uPlot | null>(null);
  const cursorLeftRef = useRef<number | null>(null);
  const [index, setIndex] = useState<number | null>(null);
  const [zoomed, setZoomed] = useState(false);
  const helpId = useId();

  useEffect(() => {
    const el = plotRef.current;
    if (!el) return;
    let frame = 0;
    const width = Math.max(200, el.clientWidth);
    const opts: uPlot.Options = {
      ...options,
      width,
      height,
      legend: { show: false },
      cursor: { drag: { x: true, y: false, setScale: true }, ...options.cursor },
      hooks: {
        ...options.hooks,
        setCursor: [
          ...(options.hooks?.setCursor ?? []),
          (u) => {
            cancelAnimationFrame(frame);
            const idx = u.cursor.idx ?? null;
            cursorLeftRef.current = u.cursor.left != null && u.cursor.left >= 0 ? u.cursor.left : null;
            frame = requestAnimationFrame(() => setIndex(idx));
          },
        ],
        setScale: [
          ...(options.hooks?.setScale ?? []),
          (u, key) => {
            if (key !== "x") return;
            const xs = u.data[0];
            const min = u.scales.x.min;
            const max = u.scales.x.max;
            if (xs.length === 0 || min == null || max == null) return;
            setZoomed(min > xs[0] || max < xs[xs.length - 1]);
          },
        ],
      },
    };
    const chart = new uPlot(opts, data, el);
    chartRef.current = chart;

    const observer = new ResizeObserver(() => {
      const w = Math.max(200, el.clientWidth);
      if (w !== chart.width) chart.setSize({ width: w, height });
    });
    observer.observe(el);
    return () => {
      cancelAnimationFrame(frame);
      observer.disconnect();
      chart.destroy();
      chartRef.current = null;
    };
  }, [options, data, height]);

  const resetZoom = useCallback(() => {
    const u = chartRef.current;
    const xs = u?.data[0];
    if (!u || !xs || xs.length === 0) return;
    u.setScale("x", { min: xs[0], max: xs[xs.length - 1] });
  }, []);

  const zoomBy = useCallback((factor: number) => {
    const u = chartRef.current;
    const xs = u?.data[0];
    if (!u || !xs || xs.length < 2) return;
    const min = u.scales.x.min ?? xs[0];
    const max = u.scales.x.max ?? xs[xs.length - 1];
    const left = cursorLeftRef.current;
    const centre = left != null ? u.posToVal(left, "x") : (min + max) / 2;
    const half = ((max - min) * factor) / 2;
    const lo = Math.max(xs[0], centre - half);
    const hi = Math.min(xs[xs.length - 1], centre + half);
    if (hi - lo <= 0) return;
    u.setScale("x", { min: lo, max: hi });
  }, []);

  const moveCursor = useCallback((fraction: number) => {
    const u = chartRef.current;
    if (!u) return;
    // The overlay is the plotting area in CSS pixels, the unit setCursor takes.
    const plotWidth = u.over.clientWidth;
    const start = cursorLeftRef.current ?? plotWidth / 2;
    const left = Math.min(plotWidth - 1, Math.max(0, start + fraction * plotWidth));
    u.setCursor({ left, top: u.over.clientHeight / 2 });
  }, []);

  const onKeyDown = (event: KeyboardEvent<HTMLDivElement>) => {
    const step = event.shiftKey ? STEP_FRACTION * 10 : STEP_FRACTION;
    if (event.key === "ArrowLeft") moveCursor(-step);
    else if (event.key === "ArrowRight") moveCursor(step);
    else if (event.key === "+" || event.key === "=") zoomBy(ZOOM_FACTOR);
    else if (event.key === "-" || event.key === "_") zoomBy(1 / ZOOM_FACTOR);
    else if (event.key === "0" || event.key === "Escape") resetZoom();
    else return;
    event.preventDefault();
  };

  return (
    <figure className={cn("min-w-0", className)}>
      <div className="flex min-h-10 flex-wrap items-center justify-between gap-2 pb-2">
        <div className="num min-w-0 font-mono text-xs text-ink-soft" aria-live="off">
          {readout(index)}
        </div>
        <div className="flex shrink-0 gap-1 no-print" role="group" aria-label={`${label}: zoom`}>
          <ChartButton onClick={() => zoomBy(ZOOM_FACTOR)} label="Zoom in">
            +
          </ChartButton>
          <ChartButton onClick={() => zoomBy(1 / ZOOM_FACTOR)} label="Zoom out">
            −
          </ChartButton>
          <ChartButton onClick={resetZoom} label="Reset zoom" disabled={!zoomed}>
            Reset
          </ChartButton>
        </div>
      </div>
      <div
        ref={plotRef}
        tabIndex={0}
        role="img"
        aria-label={label}
        aria-describedby={helpId}
        onKeyDown={onKeyDown}
        onBlur={() => setIndex(null)}
        // contain: inline-size keeps the canvas's pixel width out of the layout, so the box (and the observer
        // above) can shrink when the window narrows instead of the chart pinning the page wide.
        className="tb-uplot w-full rounded-md bg-paper-raised [contain:inline-size] focus-visible:outline-2"
        style={{ minHeight: height }}
      />
      <figcaption className="mt-2 space-y-1 text-xs text-ink-soft">
        {legend}
        <p id={helpId} className="text-ink-faint">
          Drag across the plot to zoom, double-click to zoom out. Keys: ← → move the cursor, + − zoom, 0 resets.
        </p>
      </figcaption>
    </figure>
  );
}

function ChartButton({
  onClick,
  label,
  disabled,
  children,
}: {
  onClick: () => void;
  label: string;
  disabled?: boolean;
  children: ReactNode;
}) {
  return (
    <button
      type="button"
      onClick={onClick}
      disabled={disabled}
      aria-label={label}
      title={label}
      className="h-8 min-w-8 rounded-md border border-rule-strong bg-paper-raised px-2 text-xs font-medium text-ink-soft hover:bg-paper-sunk hover:text-ink disabled:cursor-not-allowed disabled:opacity-40"
    >
      {children}
    </button>
  );
}
