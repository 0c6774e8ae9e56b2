"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { chartColors, themedAxis, withAlpha } from "@/components/charts/chart-theme";
import { UPlotChart } from "@/components/charts/uplot-chart";
import { formatDriftLeading } from "@/lib/format/numbers";
import { drawMarker, type MarkerShape } from "@/components/charts/marker-shapes";

export type ChartBuildKind = "breadboard" | "perfboard" | "pcb" | "other";

export interface BuildPredictionPoint {
  buildId: string;
  label: string;
  kind: ChartBuildKind;
  /** Construction in words ("PCB rev B"). */
  constructionName: string;
  /** (measured − predicted)/predicted of the build's latest run, ppm. */
  driftPpm: number;
}

export interface BuildsAgainstPredictionChartProps {
  points: BuildPredictionPoint[];
}

// Each kind has a shape and a colour of our palette, so the chart reads in greyscale too.
const KIND_LOOK: Record<ChartBuildKind, { shape: MarkerShape; color: string; word: string; glyph: string }> = {
  breadboard: { shape: "circle", color: chartColors.traceA, word: "Breadboard", glyph: "●" },
  perfboard: { shape: "triangle", color: chartColors.traceC, word: "Perfboard", glyph: "▲" },
  pcb: { shape: "square", color: chartColors.traceB, word: "PCB", glyph: "■" },
  other: { shape: "diamond", color: chartColors.traceD, word: "Other", glyph: "◆" },
};

/**
 * Every build of a design at its latest run's drift from prediction, one marker per build, the kind of
 * construction shown by shape and colour; zero is the prediction itself.
 */
export function BuildsAgainstPredictionChart({ points }: BuildsAgainstPredictionChartProps) {
  const sorted = useMemo(() => [...points].sort((a, b) => a.kind.localeCompare(b.kind) || a.label.localeCompare(b.label)), [points]);
  const data = useMemo<uPlot.AlignedData>(
    () => [sorted.map((_, i) => i + 1), sorted.map((p) => p.driftPpm), sorted.map(() => 0)],
    [sorted],
  );
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(
    () => ({
      scales: { x: { time: false, range: [0.5, sorted.length + 0.5] }, y: { range: (_u, min, max) => { const m = Math.max(Math.abs(min), Math.abs(max), 100) * 1.15; return [-m, m]; } } },
      axes: [
        themedAxis({ label: "Build", values: (_u, splits) => splits.map((s) => (Number.isInteger(s) ? (sorted[s - 1]?.label ?? "") : "")) }),
        themedAxis({ label: "Measured − predicted (ppm)", size: 64 }),
      ],
      series: [
        {},
        { label: "Drift", stroke: "transparent", points: { show: false } },
        { label: "Prediction", stroke: chartColors.inkSoft, width: 1, dash: [4, 4], points: { show: false } },
      ],
      hooks: {
        draw: [
          (u) => {
            const ctx = u.ctx;
            ctx.save();
            const r = 5 * devicePixelRatio;
            ctx.lineWidth = 1.5 * devicePixelRatio;
            sorted.forEach((p, i) => {
              const look = KIND_LOOK[p.kind];
              const x = u.valToPos(i + 1, "x", true);
              const y = u.valToPos(p.driftPpm, "y", true);
              ctx.fillStyle = withAlpha(look.color, 0.85);
              ctx.strokeStyle = chartColors.ink;
              drawMarker(ctx, look.shape, x, y, r);
            });
            ctx.restore();
          },
        ],
      },
    }),
    [sorted],
  );
  const kinds = [...new Set(sorted.map((p) => p.kind))];
  return (
    <UPlotChart
      options={options}
      data={data}
      height={240}
      label="Each build's latest measured frequency against its prediction, by construction"
      readout={(index) => {
        const p = index === null ? null : sorted[index];
        return p ? (
          <span>
            <span aria-hidden="true">{KIND_LOOK[p.kind].glyph} </span>
            {p.label} ({p.constructionName}): <span className="font-mono">{formatDriftLeading(p.driftPpm).main}</span> from prediction
          </span>
        ) : (
          "Move over the chart or focus it and use ← → to read a build."
        );
      }}
      legend={
        <ul className="flex flex-wrap gap-3 text-xs text-ink-soft" aria-label="Constructions">
          {kinds.map((k) => (
            <li key={k}>
              <span aria-hidden="true" style={{ color: KIND_LOOK[k].color }}>
                {KIND_LOOK[k].glyph}
              </span>{" "}
              {KIND_LOOK[k].word}
            </li>
          ))}
          <li>┄ prediction (0 ppm)</li>
        </ul>
      }
    />
  );
}
