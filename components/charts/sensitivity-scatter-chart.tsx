"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import type { ScatterSeries } from "@/components/logbook/sensitivity/scatter-data";
import { axisTickLabels } from "@/lib/format/axis";
import { formatPpm, formatQuantity } from "@/lib/format/numbers";
import { chartColors, themedAxis, withAlpha } from "./chart-theme";
import { UPlotChart } from "./uplot-chart";

export interface SensitivityScatterChartProps {
  series: ScatterSeries;
  height?: number;
}

const NAMES = { supply: { axis: "Supply (V)", unit: "V", slope: "ppm/V" }, temperature: { axis: "Temperature (°C)", unit: "°C", slope: "ppm/K" } } as const;

function Swatch({ kind, color, dash }: { kind: "dot" | "line" | "band"; color: string; dash?: string }) {
  return (
    <svg aria-hidden="true" width="22" height="12" className="shrink-0">
      {kind === "dot" ? <circle cx="11" cy="6" r="4" fill={color} /> : null}
      {kind === "line" ? <line x1="0" y1="6" x2="22" y2="6" stroke={color} strokeWidth="1.5" strokeDasharray={dash} /> : null}
      {kind === "band" ? <rect x="0" y="2" width="22" height="8" fill={color} /> : null}
    </svg>
  );
}

/**
 * Frequency against supply voltage or temperature for one build state: the runs as dots (ppm from the fitted
 * frequency at the reference point), the weighted fit as a line, the slope's ±1σ as a shaded fan about the reference,
 * and for temperature the line the parts' tempcos predict (dashed).
 */
export function SensitivityScatterChart({ series, height = 220 }: SensitivityScatterChartProps) {
  const names = NAMES[series.variable];
  const data = useMemo<uPlot.AlignedData>(() => {
    const xs = series.points.map((p) => p.x);
    const line = (slope: number) => xs.map((x) => slope * (x - series.referenceX));
    return [
      xs,
      series.points.map((p) => p.yPpm),
      line(series.slopePpm),
      line(series.slopePpm + series.slopeSigmaPpm),
      line(series.slopePpm - series.slopeSigmaPpm),
      series.predictedPpm !== null ? line(series.predictedPpm) : xs.map(() => null),
    ];
  }, [series]);

  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const pad = (lo: number, hi: number, minSpan: number): uPlot.Range.MinMax => {
      const span = Math.max(hi - lo, minSpan);
      return [lo - span * 0.12, hi + span * 0.12];
    };
    return {
      scales: { x: { time: false, range: (_u, min, max) => pad(min, max, 1) }, y: { range: (_u, min, max) => pad(min, max, 2) } },
      axes: [
        themedAxis({ label: names.axis, values: (_u, splits, _i, _s, incr) => axisTickLabels(splits, incr, { factor: 1, unit: names.unit }) }),
        themedAxis({ label: "Frequency (ppm)", size: 58, values: (_u, splits, _i, _s, incr) => axisTickLabels(splits, incr, { factor: 1, unit: "ppm" }) }),
      ],
      series: [
        {},
        { label: "Runs", stroke: chartColors.traceA, width: 0, paths: () => null, points: { show: true, size: 8, fill: chartColors.traceA, stroke: chartColors.traceA } },
        { label: "Fit", stroke: chartColors.ink, width: 1.5, points: { show: false } },
        { label: "Fit +1σ", stroke: withAlpha(chartColors.inkSoft, 0.6), width: 1, dash: [2, 3], points: { show: false } },
        { label: "Fit −1σ", stroke: withAlpha(chartColors.inkSoft, 0.6), width: 1, dash: [2, 3], points: { show: false } },
        { label: "Parts predict", stroke: chartColors.traceC, width: 1.5, dash: [8, 4], points: { show: false } },
      ],
      bands: [{ series: [3, 4], fill: withAlpha(chartColors.inkSoft, 0.12) }],
    };
  }, [names]);

  const what = series.variable === "supply" ? "supply voltage" : "temperature";
  return (
    <UPlotChart
      options={options}
      data={data}
      height={height}
      label={`Frequency against ${what} for ${series.points.length} runs, in ppm from ${formatQuantity(series.referenceHz, "Hz", 7)}, with the fitted line${series.predictedPpm !== null ? " and the parts' predicted line" : ""}`}
      readout={(i) => {
        if (i === null) return <span className="text-ink-faint">Move over the plot to read a run</span>;
        const p = series.points[i];
        if (!p) return null;
        return (
          <span className="flex flex-wrap gap-x-3 gap-y-0.5">
            <span className="font-sans font-semibold text-ink">{p.originalFilename}</span>
            <span>{formatQuantity(p.x, names.unit === "°C" ? "" : "V", 4)}{names.unit === "°C" ? " °C" : ""}</span>
            <span>{formatQuantity(p.frequencyHz, "Hz", 8)}</span>
            <span>{formatPpm(p.yPpm)}</span>
          </span>
        );
      }}
      legend={
        <>
          <ul className="flex flex-wrap gap-x-4 gap-y-1">
            <li className="flex items-center gap-1.5">
              <Swatch kind="dot" color={chartColors.traceA} />
              Runs
            </li>
            <li className="flex items-center gap-1.5">
              <Swatch kind="line" color={chartColors.ink} />
              Weighted fit, {formatPpm(series.slopePpm)}/{names.slope.split("/")[1]}
            </li>
            <li className="flex items-center gap-1.5">
              <Swatch kind="band" color={withAlpha(chartColors.inkSoft, 0.25)} />
              Slope ±1σ
            </li>
            {series.predictedPpm !== null ? (
              <li className="flex items-center gap-1.5">
                <Swatch kind="line" color={chartColors.traceC} dash="8 4" />
                Parts&apos; tempcos predict {formatPpm(series.predictedPpm)}/K
              </li>
            ) : null}
          </ul>
          <p className="text-ink-faint">
            0 ppm is the fitted {formatQuantity(series.referenceHz, "Hz", 7)} at {formatQuantity(series.referenceX, names.unit === "°C" ? "" : "V", 3)}
            {names.unit === "°C" ? " °C" : ""}.
            {series.held ? ` Runs at another ${series.held.variable === "supply" ? "supply" : "temperature"} are moved along its fitted slope to ${formatQuantity(series.held.to, series.held.variable === "supply" ? "V" : "", 3)}${series.held.variable === "supply" ? "" : " °C"}.` : ""}
            {` Each run's 1σ is at most ${formatPpm(series.largestSigmaPpm, 2).replace("+", "")}, ${series.largestSigmaPpm < 0.5 ? "smaller than its dot" : "not drawn"}.`}
          </p>
        </>
      }
    />
  );
}
