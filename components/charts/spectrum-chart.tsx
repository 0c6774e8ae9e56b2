"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { formatDecibels, formatQuantity } from "@/lib/format/numbers";
import { chartColors } from "./chart-theme";
import { engineeringAxis, unitFor } from "./axis-options";
import { themedAxis } from "./chart-theme";
import { UPlotChart } from "./uplot-chart";
import { axisTickLabels } from "@/lib/format/axis";

export interface SpectrumMarker {
  /** 1 for the fundamental, 2… for harmonics. */
  order: number;
  frequencyHz: number;
  levelDbv: number;
}

export interface SpectrumChartProps {
  frequenciesHz: number[];
  levelsDbv: number[];
  /** The fundamental and its harmonics, drawn as markers. */
  markers?: SpectrumMarker[];
  /** The spec's limit for any single harmonic, as an absolute level (fundamental dBV + limit dBc). */
  limitDbv?: number | null;
  /** The limit as the spec states it, for the legend, e.g. −40 dBc. */
  limitDbc?: number | null;
  height?: number;
}

function markerLabel(order: number): string {
  return order === 1 ? "f" : `${order}`;
}

/** Draws the harmonic markers and the limit line over the plot (canvas pixels). */
function overlayPlugin(markers: SpectrumMarker[], limitDbv: number | null | undefined): uPlot.Plugin {
  return {
    hooks: {
      draw: [
        (u) => {
          const ctx = u.ctx;
          const { left, top, width, height } = u.bbox;
          const ratio = u.bbox.width / Math.max(1, u.over.clientWidth);
          ctx.save();
          ctx.beginPath();
          ctx.rect(left, top, width, height);
          ctx.clip();
          if (typeof limitDbv === "number" && Number.isFinite(limitDbv)) {
            const y = u.valToPos(limitDbv, "y", true);
            ctx.strokeStyle = chartColors.ink;
            ctx.lineWidth = 1.5 * ratio;
            ctx.setLineDash([8 * ratio, 3 * ratio, 2 * ratio, 3 * ratio]);
            ctx.beginPath();
            ctx.moveTo(left, y);
            ctx.lineTo(left + width, y);
            ctx.stroke();
          }
          ctx.setLineDash([3 * ratio, 3 * ratio]);
          ctx.font = `600 ${11 * ratio}px system-ui, sans-serif`;
          ctx.textAlign = "center";
          for (const m of markers) {
            const x = u.valToPos(m.frequencyHz, "x", true);
            if (x < left || x > left + width) continue;
            const y = u.valToPos(m.levelDbv, "y", true);
            ctx.strokeStyle = chartColors.traceB;
            ctx.lineWidth = 1 * ratio;
            ctx.beginPath();
            ctx.moveTo(x, top + height);
            ctx.lineTo(x, y);
            ctx.stroke();
            ctx.fillStyle = chartColors.traceB;
            ctx.beginPath();
            ctx.arc(x, y, 3.5 * ratio, 0, 2 * Math.PI);
            ctx.fill();
            ctx.fillStyle = chartColors.ink;
            ctx.fillText(markerLabel(m.order), x, Math.max(top + 12 * ratio, y - 7 * ratio));
          }
          ctx.restore();
        },
      ],
    },
  };
}

function nearestMarker(markers: SpectrumMarker[], frequencyHz: number, toleranceHz: number): SpectrumMarker | undefined {
  let best: SpectrumMarker | undefined;
  for (const m of markers) {
    const d = Math.abs(m.frequencyHz - frequencyHz);
    if (d <= toleranceHz && (!best || d < Math.abs(best.frequencyHz - frequencyHz))) best = m;
  }
  return best;
}

/** The spectrum in dBV with the fundamental and harmonic markers and the spec's single-harmonic limit. */
export function SpectrumChart({ frequenciesHz, levelsDbv, markers = [], limitDbv, limitDbc, height = 260 }: SpectrumChartProps) {
  const data = useMemo<uPlot.AlignedData>(() => [frequenciesHz, levelsDbv], [frequenciesHz, levelsDbv]);
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const x = unitFor("Hz", frequenciesHz);
    return {
      scales: {
        x: { time: false },
        // Headroom above the fundamental for its label, and the limit line always in view.
        y: {
          range: (_u, min, max) => {
            const lo = Math.min(min, typeof limitDbv === "number" ? limitDbv : min);
            const hi = Math.max(max, typeof limitDbv === "number" ? limitDbv : max);
            return [Math.floor((lo - 5) / 10) * 10, Math.ceil((hi + 12) / 10) * 10];
          },
        },
      },
      axes: [
        engineeringAxis("Frequency", x),
        themedAxis({
          label: "Level (dBV)",
          size: 52,
          values: (_u, splits, _i, _s, incr) => axisTickLabels(splits, incr, { factor: 1, unit: "dBV" }),
        }),
      ],
      series: [{}, { label: "Spectrum", stroke: chartColors.traceA, width: 1, points: { show: false } }],
      plugins: [overlayPlugin(markers, limitDbv)],
    };
  }, [frequenciesHz, markers, limitDbv]);

  const binHz = frequenciesHz.length > 1 ? Math.abs(frequenciesHz[1] - frequenciesHz[0]) : 0;
  return (
    <UPlotChart
      options={options}
      data={data}
      height={height}
      label="Spectrum: level in dBV against frequency, with the fundamental and harmonics marked and the spec's harmonic limit line"
      readout={(i) => {
        if (i === null || frequenciesHz[i] === undefined) {
          return <span className="text-ink-faint">Move over the plot to read values</span>;
        }
        const marker = nearestMarker(markers, frequenciesHz[i], 2 * binHz);
        return (
          <span className="flex flex-wrap gap-x-3">
            <span>{formatQuantity(frequenciesHz[i], "Hz", 5)}</span>
            <span>{formatDecibels(levelsDbv[i], "dBV")}</span>
            {marker ? (
              <span className="font-sans font-medium text-ink">
                {marker.order === 1 ? "fundamental" : `harmonic ${marker.order}`}
              </span>
            ) : null}
          </span>
        );
      }}
      legend={
        <ul className="flex flex-wrap gap-x-4 gap-y-1">
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="20" height="8"><line x1="0" y1="4" x2="20" y2="4" stroke={chartColors.traceA} strokeWidth="1.5" /></svg>
            Spectrum
          </li>
          {markers.length > 0 ? (
            <li className="flex items-center gap-1.5">
              <svg aria-hidden="true" width="20" height="10"><line x1="10" y1="10" x2="10" y2="3" stroke={chartColors.traceB} strokeDasharray="2 2" /><circle cx="10" cy="3" r="2.5" fill={chartColors.traceB} /></svg>
              Fundamental (f) and harmonics (2, 3, …)
            </li>
          ) : null}
          {typeof limitDbv === "number" ? (
            <li className="flex items-center gap-1.5">
              <svg aria-hidden="true" width="24" height="8"><line x1="0" y1="4" x2="24" y2="4" stroke={chartColors.ink} strokeWidth="1.5" strokeDasharray="8 3 2 3" /></svg>
              Spec limit for any harmonic
              {typeof limitDbc === "number" ? ` (${formatDecibels(limitDbc, "dBc")}, ${formatDecibels(limitDbv, "dBV")})` : ""}
            </li>
          ) : null}
        </ul>
      }
    />
  );
}
