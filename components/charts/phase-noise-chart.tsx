"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { formatDecibels, formatQuantity, typographicMinus } from "@/lib/format/numbers";
import { chartColors, themedAxis } from "./chart-theme";
import { UPlotChart } from "./uplot-chart";

export interface PhaseNoiseChartProps {
  offsetHz: number[];
  /** The estimate per tenth-decade band, dBc/Hz (includes the floor's share). */
  dbcPerHz: number[];
  floorDbcPerHz: number[];
  /** Per band: the estimate does not stand clear of the floor. */
  atFloor: boolean[];
  height?: number;
}

/** A log axis shows decades: "100 Hz", "10 kHz". */
function decadeLabel(hz: number | null): string {
  // uPlot passes null for the log axis's ticks it leaves unlabelled.
  return hz == null ? "" : formatQuantity(hz, "Hz", 2, { trimZeros: true });
}

/**
 * Single-sideband phase noise 𝓛(f) against offset on a log-frequency axis, with the floor the capture's
 * additive noise and quantization set. Bands at the floor are drawn hollow: there the curve is an upper
 * bound, not a measurement.
 */
export function PhaseNoiseChart({ offsetHz, dbcPerHz, floorDbcPerHz, atFloor, height = 240 }: PhaseNoiseChartProps) {
  const data = useMemo<uPlot.AlignedData>(() => {
    const measured = dbcPerHz.map((v, i) => (atFloor[i] ? null : v));
    const bound = dbcPerHz.map((v, i) => (atFloor[i] ? v : null));
    return [offsetHz, dbcPerHz, measured, bound, floorDbcPerHz];
  }, [offsetHz, dbcPerHz, floorDbcPerHz, atFloor]);
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(
    () => ({
      scales: { x: { time: false, distr: 3, log: 10 }, y: { range: (_u, min, max) => [Math.floor((min - 5) / 10) * 10, Math.ceil((max + 5) / 10) * 10] } },
      axes: [
        themedAxis({ label: "Offset from the carrier", values: (_u, splits) => splits.map(decadeLabel) }),
        themedAxis({ label: "𝓛(f) (dBc/Hz)", size: 56, values: (_u, splits) => splits.map((v) => (v == null ? "" : typographicMinus(v.toFixed(0)))) }),
      ],
      series: [
        {},
        { label: "Estimate", stroke: chartColors.traceA, width: 1.5, points: { show: false } },
        { label: "Measured", stroke: "transparent", points: { show: true, size: 6, fill: chartColors.traceA, stroke: chartColors.traceA } },
        { label: "At the floor", stroke: "transparent", points: { show: true, size: 6, fill: chartColors.paper, stroke: chartColors.inkSoft } },
        { label: "Floor", stroke: chartColors.inkSoft, width: 1, dash: [6, 4], points: { show: false } },
      ],
    }),
    [],
  );
  return (
    <UPlotChart
      options={options}
      data={data}
      height={height}
      label="Phase noise: single-sideband level in dBc per hertz against offset from the carrier, log frequency axis, with the capture's noise floor"
      readout={(i) => {
        if (i === null || offsetHz[i] === undefined) return <span className="text-ink-faint">Move over the plot to read values</span>;
        return (
          <span className="flex flex-wrap gap-x-3">
            <span>{formatQuantity(offsetHz[i], "Hz", 3)}</span>
            <span>{atFloor[i] ? `≤ ${formatDecibels(floorDbcPerHz[i], "dBc/Hz")} (at the floor)` : formatDecibels(dbcPerHz[i], "dBc/Hz")}</span>
          </span>
        );
      }}
      legend={
        <ul className="flex flex-wrap gap-x-4 gap-y-1">
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="20" height="10"><line x1="0" y1="5" x2="20" y2="5" stroke={chartColors.traceA} strokeWidth="1.5" /><circle cx="10" cy="5" r="3" fill={chartColors.traceA} /></svg>
            Measured
          </li>
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="12" height="10"><circle cx="6" cy="5" r="3" fill={chartColors.paper} stroke={chartColors.inkSoft} /></svg>
            At the floor (reads ≤ floor)
          </li>
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="24" height="8"><line x1="0" y1="4" x2="24" y2="4" stroke={chartColors.inkSoft} strokeDasharray="6 4" /></svg>
            Floor set by the capture&apos;s noise and quantization
          </li>
        </ul>
      }
    />
  );
}
