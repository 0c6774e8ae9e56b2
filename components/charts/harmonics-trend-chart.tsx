"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { axisTickLabels } from "@/lib/format/axis";
import { runPositionAt, type TimelineSeries } from "@/lib/drift-trend/timeline";
import { formatDecibels, formatPercent } from "@/lib/format/numbers";
import { chartColors, themedAxis, withAlpha } from "./chart-theme";
import { useTweakMarkers } from "./tweak-markers";
import { UPlotChart } from "./uplot-chart";

export interface HarmonicsTrendChartProps {
  series: TimelineSeries;
  height?: number;
}

function runAxis(): uPlot.Axis {
  return themedAxis({
    label: "Run (upload order)",
    incrs: [1, 2, 5, 10, 20, 50, 100, 200, 500],
    space: 22,
    values: (_u, splits) => splits.map((v) => (Number.isInteger(v) ? `#${v}` : "")),
  });
}

/** THD as filled circles, the worst harmonic as filled squares: two shapes, so the series read apart in greyscale. */
function shapes(kind: "circle" | "square", color: string): uPlot.Series.Points {
  return {
    show: true,
    size: kind === "circle" ? 8 : 7,
    fill: color,
    stroke: color,
    width: 1,
    ...(kind === "square"
      ? {
          paths: (u: uPlot, seriesIdx: number, idx0: number, idx1: number) => {
            const size = 7 * (u.bbox.width / Math.max(1, u.over.clientWidth));
            const fill = new Path2D();
            const xs = u.data[0];
            const ys = u.data[seriesIdx];
            for (let i = idx0; i <= idx1; i++) {
              const v = ys[i];
              if (v === null || v === undefined) continue;
              const x = u.valToPos(xs[i], "x", true);
              const y = u.valToPos(v, u.series[seriesIdx].scale ?? "y", true);
              fill.rect(x - size / 2, y - size / 2, size, size);
            }
            return { stroke: fill, fill };
          },
        }
      : {}),
  };
}

function LegendSwatch({ shape, color, dash }: { shape: "circle" | "square" | "line"; color: string; dash?: string }) {
  return (
    <svg aria-hidden="true" width="22" height="12" className="shrink-0">
      {shape === "circle" ? <circle cx="11" cy="6" r="4" fill={color} /> : null}
      {shape === "square" ? <rect x="7.5" y="2.5" width="7" height="7" fill={color} /> : null}
      {shape === "line" ? <line x1="0" y1="6" x2="22" y2="6" stroke={color} strokeWidth="1.5" strokeDasharray={dash} /> : null}
    </svg>
  );
}

/**
 * Distortion per run: THD (%, left axis) and the worst single harmonic (dBc, right axis), each with the spec's limit
 * at that run, and the same tweak markers as the timeline.
 */
export function HarmonicsTrendChart({ series, height = 240 }: HarmonicsTrendChartProps) {
  const runs = series.runs;
  const { wrapRef, plugin, chips } = useTweakMarkers(series.markers, runs.length);
  const data = useMemo<uPlot.AlignedData>(
    () => [series.x, series.thdPercent, series.maxThdPercent, series.worstHarmonicDbc, series.maxHarmonicDbc],
    [series],
  );
  const hasThdLimit = series.maxThdPercent.some((v) => v !== null);
  const hasDbcLimit = series.maxHarmonicDbc.some((v) => v !== null);

  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const pad = (lo: number, hi: number, step: number): uPlot.Range.MinMax => {
      const span = Math.max(hi - lo, step);
      return [lo - span * 0.15, hi + span * 0.15];
    };
    return {
      scales: {
        x: { time: false, range: (_u, min, max) => [Math.min(0.5, min), Math.max(max, runs.length + 0.5)] },
        thd: { range: (_u, min, max) => pad(Math.min(0, min), max, 1) },
        dbc: { range: (_u, min, max) => pad(min, Math.min(0, max), 5) },
      },
      axes: [
        runAxis(),
        themedAxis({ scale: "thd", label: "THD (%)", size: 52, values: (_u, splits, _i, _s, incr) => axisTickLabels(splits, incr, { factor: 1, unit: "%" }) }),
        themedAxis({
          scale: "dbc",
          side: 1,
          label: "Worst harmonic (dBc)",
          size: 56,
          grid: { show: false },
          values: (_u, splits, _i, _s, incr) => axisTickLabels(splits, incr, { factor: 1, unit: "dBc" }),
        }),
      ],
      series: [
        {},
        { label: "THD", scale: "thd", stroke: withAlpha(chartColors.traceA, 0.7), width: 1, spanGaps: true, points: shapes("circle", chartColors.traceA) },
        { label: "THD limit", scale: "thd", stroke: chartColors.traceA, width: 1.5, dash: [6, 4], points: { show: false } },
        { label: "Worst harmonic", scale: "dbc", stroke: withAlpha(chartColors.traceC, 0.7), width: 1, spanGaps: true, points: shapes("square", chartColors.traceC) },
        { label: "Harmonic limit", scale: "dbc", stroke: chartColors.traceC, width: 1.5, dash: [8, 3, 2, 3], points: { show: false } },
      ],
      plugins: [plugin],
    };
  }, [runs.length, plugin]);

  return (
    <div ref={wrapRef} className="relative print:[&_figcaption>p:last-child]:hidden print:[&_figure>div:first-child]:hidden">
      <UPlotChart
        options={options}
        data={data}
        height={height}
        label={`Distortion per run: THD in percent and the worst harmonic in dBc for ${runs.length} runs, with the spec's limits`}
        readout={(i) => {
          if (i === null) return <span className="text-ink-faint">Move over the plot to read a run</span>;
          const run = runs[runPositionAt(i)];
          if (!run) return null;
          return (
            <span className="flex flex-wrap gap-x-3 gap-y-0.5">
              <span className="font-sans font-semibold text-ink">#{run.index}</span>
              <span>
                THD {formatPercent(run.thdPercent)}
                {typeof run.spec?.maxThdPercent === "number" ? ` (limit ${formatPercent(run.spec.maxThdPercent)})` : ""}
              </span>
              <span>
                worst harmonic {formatDecibels(run.worstHarmonicDbc, "dBc")}
                {typeof run.spec?.maxHarmonicDbc === "number" ? ` (limit ${formatDecibels(run.spec.maxHarmonicDbc, "dBc")})` : ""}
              </span>
            </span>
          );
        }}
        legend={
          <>
            <ul className="flex flex-wrap gap-x-4 gap-y-1">
              <li className="flex items-center gap-1.5">
                <LegendSwatch shape="circle" color={chartColors.traceA} />
                THD (left axis)
              </li>
              {hasThdLimit ? (
                <li className="flex items-center gap-1.5">
                  <LegendSwatch shape="line" color={chartColors.traceA} dash="6 4" />
                  THD limit
                </li>
              ) : null}
              <li className="flex items-center gap-1.5">
                <LegendSwatch shape="square" color={chartColors.traceC} />
                Worst harmonic (right axis)
              </li>
              {hasDbcLimit ? (
                <li className="flex items-center gap-1.5">
                  <LegendSwatch shape="line" color={chartColors.traceC} dash="8 3 2 3" />
                  Limit for any harmonic
                </li>
              ) : null}
            </ul>
            <p className="text-ink-faint">
              Higher on either axis is worse: more distortion, a harmonic closer to the fundamental.
              {series.markers.length > 0 ? " T markers are the tweaks listed under the timeline." : ""}
            </p>
          </>
        }
      />
      {chips}
    </div>
  );
}
