"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { formatQuantity } from "@/lib/format/numbers";
import { chartColors, withAlpha } from "./chart-theme";
import { engineeringAxis, unitFor } from "./axis-options";
import { UPlotChart } from "./uplot-chart";

export interface WaveformChartProps {
  /** Time of each envelope point, s. */
  timeS: number[];
  /** Lowest sample in each envelope bucket, V. */
  minV: number[];
  /** Highest sample in each envelope bucket, V. */
  maxV: number[];
  /** Channel name, for the label. */
  channel?: string;
  height?: number;
}

/**
 * The capture's waveform as a min/max envelope: every sample is inside the shaded band, so a glitch or a clipped
 * peak shows even when the record has millions of samples.
 */
export function WaveformChart({ timeS, minV, maxV, channel, height = 240 }: WaveformChartProps) {
  const data = useMemo<uPlot.AlignedData>(() => [timeS, maxV, minV], [timeS, minV, maxV]);
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const x = unitFor("s", timeS);
    const y = unitFor("V", minV, maxV);
    return {
      scales: { x: { time: false }, y: { auto: true } },
      axes: [engineeringAxis("Time", x), engineeringAxis("Voltage", y, { size: 56 })],
      series: [
        {},
        { label: "max", stroke: chartColors.traceA, width: 1, points: { show: false } },
        { label: "min", stroke: chartColors.traceA, width: 1, points: { show: false } },
      ],
      bands: [{ series: [1, 2], fill: withAlpha(chartColors.traceA, 0.22) }],
    };
  }, [timeS, minV, maxV]);

  const name = channel ? `channel ${channel}` : "the analysed channel";
  return (
    <UPlotChart
      options={options}
      data={data}
      height={height}
      label={`Waveform of ${name}: voltage against time, drawn as a min/max envelope`}
      readout={(i) =>
        i === null || timeS[i] === undefined ? (
          <span className="text-ink-faint">Move over the plot to read values</span>
        ) : (
          <span className="flex flex-wrap gap-x-3">
            <span>t {formatQuantity(timeS[i], "s", 4)}</span>
            <span>max {formatQuantity(maxV[i], "V", 4)}</span>
            <span>min {formatQuantity(minV[i], "V", 4)}</span>
          </span>
        )
      }
      legend={
        <p className="flex items-center gap-2">
          <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm" style={{ background: withAlpha(chartColors.traceA, 0.35), border: `1px solid ${chartColors.traceA}` }} />
          Envelope of {name}: the band spans the lowest and highest sample in each time slice.
        </p>
      }
    />
  );
}
