"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { axisTickLabels } from "@/lib/format/axis";
import { alignSpectra } from "@/lib/drift-trend/spectrum-overlay";
import { formatDecibels, formatQuantity } from "@/lib/format/numbers";
import { chartColors, themedAxis } from "./chart-theme";
import { engineeringAxis, unitFor } from "./axis-options";
import { UPlotChart } from "./uplot-chart";

export interface OverlaySpectrum {
  /** Short name for the legend and readout, e.g. "A · bb1-first.csv". */
  label: string;
  frequencyHz: number[];
  levelsDbv: number[];
}

export interface SpectrumOverlayChartProps {
  a: OverlaySpectrum;
  b: OverlaySpectrum;
  height?: number;
}

/** Two runs' spectra on one axis (dBV): A solid, B dashed, so they stay apart without colour. */
export function SpectrumOverlayChart({ a, b, height = 300 }: SpectrumOverlayChartProps) {
  const aligned = useMemo(() => alignSpectra({ frequencyHz: a.frequencyHz, levels: a.levelsDbv }, { frequencyHz: b.frequencyHz, levels: b.levelsDbv }), [a, b]);
  const data = useMemo<uPlot.AlignedData>(() => [aligned.frequencyHz, aligned.a, aligned.b], [aligned]);
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const x = unitFor("Hz", aligned.frequencyHz);
    return {
      scales: {
        x: { time: false },
        y: { range: (_u, min, max) => [Math.floor((min - 5) / 10) * 10, Math.ceil((max + 5) / 10) * 10] },
      },
      axes: [
        engineeringAxis("Frequency", x),
        themedAxis({ label: "Level (dBV)", size: 52, values: (_u, splits, _i, _s, incr) => axisTickLabels(splits, incr, { factor: 1, unit: "dBV" }) }),
      ],
      series: [
        {},
        { label: a.label, stroke: chartColors.traceA, width: 1.2, spanGaps: true, points: { show: false } },
        { label: b.label, stroke: chartColors.traceB, width: 1.2, dash: [5, 3], spanGaps: true, points: { show: false } },
      ],
    };
  }, [aligned, a.label, b.label]);

  const nearest = (values: (number | null)[], i: number): number | null => {
    // The other run may have no point at this frequency; read its nearest one either side.
    for (let d = 0; d < 4; d++) {
      if (values[i - d] != null) return values[i - d] as number;
      if (values[i + d] != null) return values[i + d] as number;
    }
    return null;
  };

  return (
    <UPlotChart
      options={options}
      data={data}
      height={height}
      label={`Spectra of two runs overlaid: ${a.label} solid, ${b.label} dashed, level in dBV against frequency`}
      readout={(i) => {
        if (i === null || aligned.frequencyHz[i] === undefined) return <span className="text-ink-faint">Move over the plot to read both spectra</span>;
        const la = nearest(aligned.a, i);
        const lb = nearest(aligned.b, i);
        return (
          <span className="flex flex-wrap gap-x-3">
            <span>{formatQuantity(aligned.frequencyHz[i], "Hz", 5)}</span>
            <span>A {formatDecibels(la, "dBV")}</span>
            <span>B {formatDecibels(lb, "dBV")}</span>
            {la !== null && lb !== null ? <span>B − A {formatDecibels(lb - la, "dB")}</span> : null}
          </span>
        );
      }}
      legend={
        <ul className="flex flex-wrap gap-x-4 gap-y-1">
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="22" height="8">
              <line x1="0" y1="4" x2="22" y2="4" stroke={chartColors.traceA} strokeWidth="1.5" />
            </svg>
            {a.label}
          </li>
          <li className="flex items-center gap-1.5">
            <svg aria-hidden="true" width="22" height="8">
              <line x1="0" y1="4" x2="22" y2="4" stroke={chartColors.traceB} strokeWidth="1.5" strokeDasharray="5 3" />
            </svg>
            {b.label}
          </li>
        </ul>
      }
    />
  );
}
