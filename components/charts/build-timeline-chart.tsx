"use client";

import { useMemo } from "react";
import type uPlot from "uplot";
import { runPositionAt, type TimelineRun, type TimelineSeries } from "@/lib/drift-trend/timeline";
import { formatQuantity, formatRange, formatWithUncertainty } from "@/lib/format/numbers";
import { chartColors, themedAxis, withAlpha } from "./chart-theme";
import { engineeringAxis, unitFor } from "./axis-options";
import { TweakMarkerList, useTweakMarkers } from "./tweak-markers";
import { UPlotChart } from "./uplot-chart";

export interface BuildTimelineChartProps {
  series: TimelineSeries;
  height?: number;
}

// Series order in the aligned data (index 0 is x).
const S = { worstMax: 1, worstMin: 2, statMax: 3, statMin: 4, tolHigh: 5, tolLow: 6, target: 7, predicted: 8, measured: 9 } as const;

/** Run ticks only on whole numbers: x is the run's position, not a time. */
function runAxis(): uPlot.Axis {
  return themedAxis({
    label: "Run (upload order)",
    incrs: [1, 2, 5, 10, 20, 50, 100, 200, 500],
    space: 22,
    values: (_u, splits) => splits.map((v) => (Number.isInteger(v) ? `#${v}` : "")),
  });
}

/** Error bars and the measured points, shaped by verdict: filled circle pass, hollow diamond fail, ring otherwise. */
function measuredPlugin(runs: TimelineRun[]): uPlot.Plugin {
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
          for (const run of runs) {
            if (run.measuredHz === null) continue;
            const x = u.valToPos(run.index, "x", true);
            const y = u.valToPos(run.measuredHz, "y", true);
            const u95 = run.frequencyUncertaintyHz;
            if (u95 !== null && u95 > 0) {
              const lo = u.valToPos(run.measuredHz - u95, "y", true);
              const hi = u.valToPos(run.measuredHz + u95, "y", true);
              ctx.strokeStyle = chartColors.traceA;
              ctx.lineWidth = 1.2 * ratio;
              ctx.setLineDash([]);
              ctx.beginPath();
              ctx.moveTo(x, lo);
              ctx.lineTo(x, hi);
              ctx.moveTo(x - 4 * ratio, lo);
              ctx.lineTo(x + 4 * ratio, lo);
              ctx.moveTo(x - 4 * ratio, hi);
              ctx.lineTo(x + 4 * ratio, hi);
              ctx.stroke();
            }
            const r = 4.5 * ratio;
            ctx.setLineDash([]);
            ctx.lineWidth = 1.8 * ratio;
            ctx.beginPath();
            if (run.verdict === "fail") {
              ctx.moveTo(x, y - r * 1.3);
              ctx.lineTo(x + r * 1.3, y);
              ctx.lineTo(x, y + r * 1.3);
              ctx.lineTo(x - r * 1.3, y);
              ctx.closePath();
              ctx.fillStyle = chartColors.paper;
              ctx.fill();
              ctx.strokeStyle = chartColors.fail;
              ctx.stroke();
            } else {
              ctx.arc(x, y, r, 0, 2 * Math.PI);
              ctx.fillStyle = run.verdict === "pass" ? chartColors.traceA : chartColors.paper;
              ctx.fill();
              ctx.strokeStyle = chartColors.traceA;
              ctx.stroke();
            }
          }
          ctx.restore();
        },
      ],
    },
  };
}

function LegendSwatch({ kind, color, faint = false }: { kind: "line" | "dash" | "fill" | "dot" | "diamond"; color: string; faint?: boolean }) {
  return (
    <svg aria-hidden="true" width="22" height="12" className="shrink-0">
      {kind === "fill" ? <rect x="1" y="2" width="20" height="8" fill={withAlpha(color, faint ? 0.12 : 0.3)} stroke={color} strokeWidth="0.8" strokeDasharray={faint ? "2 2" : undefined} /> : null}
      {kind === "line" ? <line x1="0" y1="6" x2="22" y2="6" stroke={color} strokeWidth="2" /> : null}
      {kind === "dash" ? <line x1="0" y1="6" x2="22" y2="6" stroke={color} strokeWidth="1.2" strokeDasharray="4 3" /> : null}
      {kind === "dot" ? <circle cx="11" cy="6" r="4" fill={color} /> : null}
      {kind === "diamond" ? <path d="M11 1 L16 6 L11 11 L6 6 Z" fill={chartColors.paper} stroke={color} strokeWidth="1.6" /> : null}
    </svg>
  );
}

/**
 * The drift story of a build: measured frequency per run (with its uncertainty), the prediction at each run
 * (stepping where a tweak changed a part), the worst-case and statistical bands, the spec's target and tolerance,
 * and a marker for every tweak (hover or focus the "T" chips to read what changed).
 */
export function BuildTimelineChart({ series, height = 300 }: BuildTimelineChartProps) {
  const runs = series.runs;
  const { wrapRef, plugin, chips } = useTweakMarkers(series.markers, runs.length);
  const data = useMemo<uPlot.AlignedData>(
    () => [
      series.x,
      series.worstMaxHz,
      series.worstMinHz,
      series.statMaxHz,
      series.statMinHz,
      series.toleranceHighHz,
      series.toleranceLowHz,
      series.targetHz,
      series.predictedHz,
      series.measuredHz,
    ],
    [series],
  );
  const hasBands = series.worstMaxHz.some((v) => v !== null);
  const hasStat = series.statMaxHz.some((v) => v !== null);
  const hasTarget = series.targetHz.some((v) => v !== null);
  const hasTolerance = series.toleranceHighHz.some((v) => v !== null);

  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const y = unitFor("Hz", series.measuredHz, series.worstMaxHz, series.toleranceHighHz, series.predictedHz);
    const line = (label: string, stroke: string, width: number, dash?: number[]): uPlot.Series => ({
      label,
      stroke,
      width,
      dash,
      points: { show: false },
      spanGaps: false,
    });
    return {
      scales: {
        x: { time: false, range: (_u, min, max) => [Math.min(0.5, min), Math.max(max, runs.length + 0.5)] },
        y: {
          range: (_u, min, max) => {
            const pad = Math.max((max - min) * 0.08, Math.abs(max) * 1e-6);
            return [min - pad, max + pad];
          },
        },
      },
      axes: [runAxis(), engineeringAxis("Frequency", y, { size: 64 })],
      series: [
        {},
        line("Worst-case high", withAlpha(chartColors.traceB, 0.55), 1, [3, 3]),
        line("Worst-case low", withAlpha(chartColors.traceB, 0.55), 1, [3, 3]),
        line("Statistical high", withAlpha(chartColors.traceB, 0), 0),
        line("Statistical low", withAlpha(chartColors.traceB, 0), 0),
        line("Tolerance high", chartColors.ink, 1, [6, 4]),
        line("Tolerance low", chartColors.ink, 1, [6, 4]),
        line("Target", chartColors.ink, 1.5),
        line("Predicted", chartColors.traceB, 2),
        { label: "Measured", stroke: withAlpha(chartColors.traceA, 0.6), width: 1, points: { show: false }, spanGaps: true },
      ],
      bands: [
        { series: [S.worstMax, S.worstMin], fill: withAlpha(chartColors.traceB, 0.07) },
        { series: [S.statMax, S.statMin], fill: withAlpha(chartColors.traceB, 0.24) },
      ],
      plugins: [measuredPlugin(runs), plugin],
    };
  }, [series, runs, plugin]);

  const label = `Build timeline: measured frequency of ${runs.length} runs in upload order against the prediction, its worst-case and statistical bands${hasTarget ? ", and the spec's target and tolerance" : ""}`;
  return (
    <div ref={wrapRef} className="relative print:[&_figcaption>p:last-child]:hidden print:[&_figure>div:first-child]:hidden">
      <UPlotChart
        options={options}
        data={data}
        height={height}
        label={label}
        readout={(i) => {
          if (i === null) return <span className="text-ink-faint">Move over the plot, or focus it and use ← →, to read a run</span>;
          const run = runs[runPositionAt(i)];
          if (!run) return null;
          const f = formatWithUncertainty(run.measuredHz, run.frequencyUncertaintyHz, "Hz", 7, 9);
          const marker = series.markers.find((m) => m.x === run.index - 0.5);
          return (
            <span className="flex flex-wrap gap-x-3 gap-y-0.5">
              <span className="font-sans font-semibold text-ink">#{run.index}</span>
              <span className="max-w-[14rem] truncate font-sans">{run.originalFilename}</span>
              <span>measured {f.text}</span>
              <span>predicted {formatQuantity(run.predictedHz, "Hz", 6)}</span>
              {run.worstCase ? <span>worst case {formatRange(run.worstCase.minHz, run.worstCase.maxHz, "Hz", 5)}</span> : null}
              {marker ? (
                <span className="font-sans text-trace-d">
                  after T{marker.number}: {marker.tweaks.map((t) => t.text).join("; ")}
                </span>
              ) : null}
            </span>
          );
        }}
        legend={
          <>
            <ul className="flex flex-wrap gap-x-4 gap-y-1">
              <li className="flex items-center gap-1.5">
                <LegendSwatch kind="dot" color={chartColors.traceA} />
                Measured ± uncertainty (filled: pass, ring: no verdict)
              </li>
              <li className="flex items-center gap-1.5">
                <LegendSwatch kind="diamond" color={chartColors.fail} />
                Measured, flagged
              </li>
              <li className="flex items-center gap-1.5">
                <LegendSwatch kind="line" color={chartColors.traceB} />
                Predicted (steps where a tweak changed a part)
              </li>
              {hasBands ? (
                <li className="flex items-center gap-1.5">
                  <LegendSwatch kind="fill" color={chartColors.traceB} faint />
                  Worst-case band (dashed edges)
                </li>
              ) : null}
              {hasStat ? (
                <li className="flex items-center gap-1.5">
                  <LegendSwatch kind="fill" color={chartColors.traceB} />
                  Statistical band
                </li>
              ) : null}
              {hasTarget ? (
                <li className="flex items-center gap-1.5">
                  <LegendSwatch kind="line" color={chartColors.ink} />
                  Target
                </li>
              ) : null}
              {hasTolerance ? (
                <li className="flex items-center gap-1.5">
                  <LegendSwatch kind="dash" color={chartColors.ink} />
                  Spec tolerance
                </li>
              ) : null}
            </ul>
            <TweakMarkerList markers={series.markers} runCount={runs.length} />
          </>
        }
      />
      {chips}
    </div>
  );
}
