"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { formatQuantity } from "@/lib/format/numbers";
import { chartColors, themedAxis } from "./chart-theme";
import { UPlotChart } from "./uplot-chart";

export interface AllanChartPoint {
  tauS: number;
  adev: number;
  lowerAdev: number;
  upperAdev: number;
  floorAdev: number;
  atFloor: boolean;
}

export interface AllanChartProps {
  points: AllanChartPoint[];
  height?: number;
}

// uPlot passes null for the log axis's ticks it leaves unlabelled.
function sci(value: number | null): string {
  return value === null || !Number.isFinite(value) ? "" : value.toExponential(1).replace("-", "\u2212");
}

// A log axis cannot show 0 (a noiseless synthetic record): leave such values out rather than break the scale.
function positive(v: number): number | null {
  return v > 0 && Number.isFinite(v) ? v : null;
}

/** Vertical bars from lowerAdev to upperAdev at each τ (canvas pixels). */
function intervalPlugin(points: AllanChartPoint[]): uPlot.Plugin {
  return {
    hooks: {
      draw: [
        (u) => {
          const ctx = u.ctx;
          const ratio = u.bbox.width / Math.max(1, u.over.clientWidth);
          ctx.save();
          ctx.strokeStyle = chartColors.traceB;
          ctx.lineWidth = 1.25 * ratio;
          for (const p of points) {
            if (!(p.lowerAdev > 0)) continue;
            const x = u.valToPos(p.tauS, "x", true);
            const y0 = u.valToPos(p.lowerAdev, "y", true);
            const y1 = u.valToPos(p.upperAdev, "y", true);
            ctx.beginPath();
            ctx.moveTo(x, y0);
            ctx.lineTo(x, y1);
            ctx.moveTo(x - 3 * ratio, y0);
            ctx.lineTo(x + 3 * ratio, y0);
            ctx.moveTo(x - 3 * ratio, y1);
            ctx.lineTo(x + 3 * ratio, y1);
            ctx.stroke();
          }
          ctx.restore();
        },
      ],
    },
  };
}

/** Overlapping Allan deviation within the record, log-log, with 68 % intervals and the additive-noise floor. */
export function AllanChart({ points, height = 240 }: AllanChartProps) {
  const data = useMemo<uPlot.AlignedData>(
    () => [
      points.map((p) => p.tauS),
      points.map((p) => (p.atFloor ? null : positive(p.adev))),
      points.map((p) => (p.atFloor ? positive(p.adev) : null)),
      points.map((p) => positive(p.floorAdev)),
    ],
    [points],
  );
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(
    () => ({
      scales: { x: { time: false, distr: 3, log: 10 }, y: { distr: 3, log: 10 } },
      axes: [
        themedAxis({ label: "Averaging time τ", values: (_u, splits) => splits.map((v) => (v == null ? "" : formatQuantity(v, "s", 2, { trimZeros: true }))) }),
        themedAxis({ label: "σ_y(τ)", size: 64, values: (_u, splits) => splits.map(sci) }),
      ],
      series: [
        {},
        { label: "Allan deviation", stroke: chartColors.traceB, width: 1.5, points: { show: true, size: 6, fill: chartColors.traceB } },
        { label: "At the floor", stroke: "transparent", points: { show: true, size: 6, fill: chartColors.paper, stroke: chartColors.inkSoft } },
        { label: "Floor", stroke: chartColors.inkSoft, width: 1, dash: [6, 4], points: { show: false } },
      ],
      plugins: [intervalPlugin(points)],
    }),
    [points],
  );
  return (
    <UPlotChart
      options={options}
      data={data}
      height={height}
      label="Allan deviation within the record against averaging time, log-log, with 68 percent intervals and the floor the capture's noise sets"
      readout={(i) => {
        const p = i === null ? undefined : points[i];
        if (!p) return <span className="text-ink-faint">Move over the plot to read values</span>;
        return (
          <span className="flex flex-wrap gap-x-3">
            <span>τ {formatQuantity(p.tauS, "s", 3)}</span>
            <span>
              σ_y {p.atFloor ? "≤ " : ""}
              {sci(p.adev)} ({sci(p.lowerAdev)} … {sci(p.upperAdev)})
            </span>
            {p.atFloor ? <span className="font-sans text-ink-soft">at the floor</span> : null}
          </span>
        );
      }}
      legend={
        <ul className="flex flex-wrap gap-x-4 gap-y-1">
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="20" height="12"><line x1="10" y1="1" x2="10" y2="11" stroke={chartColors.traceB} /><circle cx="10" cy="6" r="3" fill={chartColors.traceB} /></svg>
            σ_y(τ) with its 68 % interval
          </li>
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="12" height="10"><circle cx="6" cy="5" r="3" fill={chartColors.paper} stroke={chartColors.inkSoft} /></svg>
            At the floor (reads ≤)
          </li>
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="24" height="8"><line x1="0" y1="4" x2="24" y2="4" stroke={chartColors.inkSoft} strokeDasharray="6 4" /></svg>
            Floor of the capture&apos;s additive noise (white PM, τ⁻¹)
          </li>
        </ul>
      }
    />
  );
}
