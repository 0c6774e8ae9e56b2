"use client";

import { useCallback, useEffect, useMemo, useRef, useState, type ReactNode } from "react";
import type uPlot from "uplot";
import type { TimelineMarker } from "@/lib/drift-trend/timeline";
import { formatDateTime } from "@/lib/format/dates";
import { chartColors } from "./chart-theme";

/** Where the plotting area sits inside the wrapper, and each marker's x there (CSS px; null when off the plot). */
interface MarkerLayout {
  left: number;
  top: number;
  width: number;
  xs: (number | null)[];
}

/** Dashed vertical lines with "T1", "T2"… drawn on the canvas, so they also print. */
function drawMarkers(u: uPlot, markers: TimelineMarker[]): void {
  const ctx = u.ctx;
  const { left, top, width, height } = u.bbox;
  const ratio = u.bbox.width / Math.max(1, u.over.clientWidth);
  ctx.save();
  ctx.beginPath();
  ctx.rect(left, top, width, height);
  ctx.clip();
  ctx.font = `600 ${10 * ratio}px system-ui, sans-serif`;
  ctx.textAlign = "center";
  for (const m of markers) {
    const x = u.valToPos(m.x, "x", true);
    if (x < left || x > left + width) continue;
    ctx.strokeStyle = chartColors.traceD;
    ctx.lineWidth = (m.changesPart ? 1.5 : 1) * ratio;
    // A part change is a long dash, a note-only tweak a dotted line: the two stay apart in greyscale.
    ctx.setLineDash(m.changesPart ? [6 * ratio, 3 * ratio] : [1.5 * ratio, 3 * ratio]);
    ctx.beginPath();
    ctx.moveTo(x, top + 14 * ratio);
    ctx.lineTo(x, top + height);
    ctx.stroke();
    ctx.fillStyle = chartColors.traceD;
    ctx.fillText(`T${m.number}`, x, top + 10 * ratio);
  }
  ctx.restore();
}

/** The words of one marker: every tweak at that place, for its label and its popover. */
export function markerText(m: TimelineMarker, runCount: number): string {
  const where = m.x < 1 ? "before the first run" : m.x > runCount ? `after run ${runCount} (not measured yet)` : `between runs ${m.x - 0.5} and ${m.x + 0.5}`;
  return `Tweak T${m.number}, ${where}: ${m.tweaks.map((t) => t.text).join("; ")}`;
}

/**
 * Tweak markers for a uPlot chart: a canvas plugin that draws them, and focusable chips over the plot that show
 * what changed on hover or focus. The chips sit outside the plot's `role="img"` element so assistive technology
 * reaches them; they follow zoom and resize.
 *
 * @returns the wrapper ref (put it on a `relative` element around the chart), the plugin for the chart's options,
 *   and the chips to render inside the wrapper.
 */
export function useTweakMarkers(markers: TimelineMarker[], runCount: number): { wrapRef: React.RefObject<HTMLDivElement | null>; plugin: uPlot.Plugin; chips: ReactNode } {
  const wrapRef = useRef<HTMLDivElement>(null);
  const chartRef = useRef<uPlot | null>(null);
  const [layout, setLayout] = useState<MarkerLayout | null>(null);

  const measure = useCallback(
    (u: uPlot) => {
      const wrap = wrapRef.current;
      if (!wrap || !u.over.isConnected) return;
      const over = u.over.getBoundingClientRect();
      const box = wrap.getBoundingClientRect();
      const min = u.scales.x.min ?? -Infinity;
      const max = u.scales.x.max ?? Infinity;
      setLayout({
        left: over.left - box.left,
        top: over.top - box.top,
        width: over.width,
        xs: markers.map((m) => (m.x < min || m.x > max ? null : u.valToPos(m.x, "x"))),
      });
    },
    [markers],
  );

  const plugin = useMemo<uPlot.Plugin>(
    () => ({
      hooks: {
        ready: [
          (u) => {
            chartRef.current = u;
            measure(u);
          },
        ],
        setSize: [(u) => measure(u)],
        setScale: [(u, key) => (key === "x" ? measure(u) : undefined)],
        draw: [(u) => drawMarkers(u, markers)],
        destroy: [
          (u) => {
            if (chartRef.current === u) chartRef.current = null;
          },
        ],
      },
    }),
    [markers, measure],
  );

  useEffect(() => {
    const wrap = wrapRef.current;
    if (!wrap) return;
    // The readout line above the plot can wrap and push the plot down; follow it.
    const observer = new ResizeObserver(() => {
      if (chartRef.current) measure(chartRef.current);
    });
    observer.observe(wrap);
    return () => observer.disconnect();
  }, [measure]);

  const chips =
    layout && markers.length > 0 ? (
      <ul className="no-print" aria-label="Tweaks on this chart">
        {markers.map((m, i) => {
          const x = layout.xs[i];
          if (x === null || x === undefined) return null;
          const alignRight = x > layout.width * 0.6;
          return (
            <li key={m.number} className="group absolute z-10" style={{ left: layout.left + x - 12, top: layout.top }}>
              <button
                type="button"
                aria-label={markerText(m, runCount)}
                onMouseDown={(e) => e.stopPropagation()}
                className="h-5 min-w-6 rounded border border-trace-d/60 bg-paper-raised px-1 font-mono text-[10px] font-semibold leading-none text-trace-d shadow-sm hover:bg-paper-sunk"
              >
                T{m.number}
              </button>
              <div
                role="tooltip"
                className={`pointer-events-none absolute top-6 hidden w-64 max-w-[80vw] rounded-md border border-rule-strong bg-paper-raised px-3 py-2 text-xs leading-snug text-ink shadow-md group-focus-within:block group-hover:block ${alignRight ? "right-0" : "left-0"}`}
              >
                <p className="font-semibold">Tweak T{m.number}</p>
                <ul className="mt-1 space-y-1">
                  {m.tweaks.map((t) => (
                    <li key={t.id}>
                      <span className="num block font-mono text-[11px] text-ink-faint">{formatDateTime(t.createdAt)}</span>
                      {t.text}
                    </li>
                  ))}
                </ul>
              </div>
            </li>
          );
        })}
      </ul>
    ) : null;

  return { wrapRef, plugin, chips };
}

/** The list of tweaks under a chart: the same words as the chips, readable without hovering and on paper. */
export function TweakMarkerList({ markers, runCount }: { markers: TimelineMarker[]; runCount: number }) {
  if (markers.length === 0) return null;
  return (
    <ol className="mt-1 space-y-0.5">
      {markers.map((m) => (
        <li key={m.number} className="flex gap-2">
          <span className="num shrink-0 font-mono font-semibold text-trace-d">T{m.number}</span>
          <span>
            {m.x < 1 ? "Before run 1" : m.x > runCount ? `After run ${runCount}` : `Runs ${m.x - 0.5}→${m.x + 0.5}`}: {m.tweaks.map((t) => t.text).join("; ")}
          </span>
        </li>
      ))}
    </ol>
  );
}
