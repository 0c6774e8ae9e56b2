"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { formatQuantity } from "@/lib/format/numbers";
import { engineeringAxis, unitFor } from "./axis-options";
import { chartColors } from "./chart-theme";
import { UPlotChart } from "./uplot-chart";

export interface EnvelopeChartProps {
  timeS: number[];
  amplitudeVpk: number[];
  /** A level to draw across the plot (90 % of the settled amplitude of a start-up), V peak. */
  markVpk?: number | null;
  markLabel?: string;
  height?: number;
}

/** The fundamental's amplitude per period across the record: the start-up or ring-down the figures describe. */
export function EnvelopeChart({ timeS, amplitudeVpk, markVpk, markLabel, height = 200 }: EnvelopeChartProps) {
  const data = useMemo<uPlot.AlignedData>(
    () => (typeof markVpk === "number" ? [timeS, amplitudeVpk, timeS.map(() => markVpk)] : [timeS, amplitudeVpk]),
    [timeS, amplitudeVpk, markVpk],
  );
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const series: uPlot.Series[] = [{}, { label: "Envelope", stroke: chartColors.traceC, width: 1.5, points: { show: false } }];
    if (typeof markVpk === "number") series.push({ label: markLabel ?? "Level", stroke: chartColors.inkSoft, width: 1, dash: [6, 4], points: { show: false } });
    return {
      scales: { x: { time: false }, y: { range: (_u, _min, max) => [0, max * 1.08] } },
      axes: [engineeringAxis("Time", unitFor("s", timeS)), engineeringAxis("Amplitude", unitFor("V", amplitudeVpk), { size: 56 })],
      series,
    };
  }, [timeS, amplitudeVpk, markVpk, markLabel]);
  return (
    <UPlotChart
      options={options}
      data={data}
      height={height}
      label="Envelope: the fundamental's peak amplitude per period against time"
      readout={(i) =>
        i === null || timeS[i] === undefined ? (
          <span className="text-ink-faint">Move over the plot to read values</span>
        ) : (
          <span className="flex flex-wrap gap-x-3">
            <span>{formatQuantity(timeS[i], "s", 4)}</span>
            <span>{formatQuantity(amplitudeVpk[i], "V", 4)} peak</span>
          </span>
        )
      }
      legend={
        typeof markVpk === "number" ? (
          <span className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="24" height="8"><line x1="0" y1="4" x2="24" y2="4" stroke={chartColors.inkSoft} strokeDasharray="6 4" /></svg>
            {markLabel}
          </span>
        ) : null
      }
    />
  );
}
