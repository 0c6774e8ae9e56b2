"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { chartColors, themedAxis, withAlpha } from "@/components/charts/chart-theme";
import { UPlotChart } from "@/components/charts/uplot-chart";
import { formatDecibels } from "@/lib/format/numbers";
import { MARKER_GLYPHS, drawMarker, type MarkerShape } from "@/components/charts/marker-shapes";

export interface HarmonicsOverlayBuild {
  buildId: string;
  label: string;
  /** Measured levels of the compared run, by order; orders not measured are absent (drawn as gaps, never as 0). */
  harmonics: { order: number; dBc: number }[];
}

export interface HarmonicsOverlayChartProps {
  builds: HarmonicsOverlayBuild[];
}

// Build n takes colour and shape n, so overlaid traces stay apart in greyscale too; more than four builds repeat the
// colours with the next shape.
const COLORS = [chartColors.traceA, chartColors.traceB, chartColors.traceC, chartColors.traceD];
const SHAPES: MarkerShape[] = ["circle", "square", "triangle", "diamond"];
const DASHES: number[][] = [[], [6, 3], [2, 3], [8, 3, 2, 3]];

function look(i: number) {
  const shape = SHAPES[(i + Math.floor(i / COLORS.length)) % SHAPES.length];
  return { color: COLORS[i % COLORS.length], shape, glyph: MARKER_GLYPHS[shape], dash: DASHES[i % DASHES.length] };
}

/** The harmonic levels (dBc) of each compared run over one axis of harmonic order, one trace and marker shape per build. */
export function HarmonicsOverlayChart({ builds }: HarmonicsOverlayChartProps) {
  const orders = useMemo(() => [...new Set(builds.flatMap((b) => b.harmonics.map((h) => h.order)))].sort((a, b) => a - b), [builds]);
  const data = useMemo<uPlot.AlignedData>(
    () => [orders, ...builds.map((b) => orders.map((n) => b.harmonics.find((h) => h.order === n)?.dBc ?? null))],
    [builds, orders],
  );
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(
    () => ({
      scales: { x: { time: false, range: [Math.min(...orders) - 0.5, Math.max(...orders) + 0.5] } },
      axes: [
        themedAxis({ label: "Harmonic order", values: (_u, splits) => splits.map((s) => (Number.isInteger(s) && orders.includes(s) ? `H${s}` : "")) }),
        themedAxis({ label: "Level (dBc)", size: 56 }),
      ],
      series: [
        {},
        ...builds.map((b, i) => ({ label: b.label, stroke: look(i).color, width: 1.5, dash: look(i).dash, spanGaps: false, points: { show: false } })),
      ],
      hooks: {
        draw: [
          (u) => {
            const ctx = u.ctx;
            ctx.save();
            const r = 4.5 * devicePixelRatio;
            ctx.lineWidth = 1.25 * devicePixelRatio;
            builds.forEach((_b, i) => {
              const l = look(i);
              const ys = data[i + 1] as (number | null)[];
              orders.forEach((n, j) => {
                const y = ys[j];
                if (y === null || y === undefined) return;
                ctx.fillStyle = withAlpha(l.color, 0.9);
                ctx.strokeStyle = chartColors.ink;
                drawMarker(ctx, l.shape, u.valToPos(n, "x", true), u.valToPos(y, "y", true), r);
              });
            });
            ctx.restore();
          },
        ],
      },
    }),
    [builds, orders, data],
  );
  if (orders.length === 0) {
    return <p className="text-sm text-ink-soft">No harmonic levels measured on the compared runs, so there is nothing to overlay.</p>;
  }
  return (
    <UPlotChart
      options={options}
      data={data}
      height={240}
      label="Harmonic levels of the compared runs, overlaid by harmonic order"
      readout={(index) => {
        const n = index === null ? null : orders[index];
        return n == null ? (
          "Move over the chart or focus it and use ← → to read a harmonic."
        ) : (
          <span>
            H{n}:{" "}
            {builds.map((b, i) => {
              const h = b.harmonics.find((x) => x.order === n);
              return (
                <span key={b.buildId} className="mr-3 inline-block">
                  <span aria-hidden="true" style={{ color: look(i).color }}>
                    {look(i).glyph}{" "}
                  </span>
                  {b.label} <span className="font-mono">{h ? formatDecibels(h.dBc, "dBc") : "not measured"}</span>
                </span>
              );
            })}
          </span>
        );
      }}
      legend={
        <ul className="flex flex-wrap gap-3 text-xs text-ink-soft" aria-label="Builds">
          {builds.map((b, i) => (
            <li key={b.buildId}>
              <span aria-hidden="true" style={{ color: look(i).color }}>
                {look(i).glyph}
              </span>{" "}
              {b.label}
            </li>
          ))}
        </ul>
      }
    />
  );
}
