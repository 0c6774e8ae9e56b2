import type uPlot from "uplot";
import config from "@/tailwind.config";

const colors = config.theme.extend.colors;

/** Colours of our palette for canvas drawing (uPlot cannot read Tailwind classes). */
export const chartColors = {
  traceA: colors.trace.a,
  traceB: colors.trace.b,
  traceC: colors.trace.c,
  traceD: colors.trace.d,
  ink: colors.ink.DEFAULT,
  inkSoft: colors.ink.soft,
  inkFaint: colors.ink.faint,
  rule: colors.rule.DEFAULT,
  ruleStrong: colors.rule.strong,
  paper: colors.paper.raised,
  fail: colors.verdict.fail,
} as const;

/** `#rrggbb` with an alpha from 0 to 1, for fills. */
export function withAlpha(hex: string, alpha: number): string {
  const a = Math.round(Math.min(1, Math.max(0, alpha)) * 255)
    .toString(16)
    .padStart(2, "0");
  return `${hex}${a}`;
}

const axisFont = '11px var(--font-mono), ui-monospace, monospace';
const labelFont = '600 11px var(--font-inter), system-ui, sans-serif';

/** An axis in our look: faint grid, mono tick labels, soft ink. */
export function themedAxis(axis: uPlot.Axis): uPlot.Axis {
  return {
    stroke: chartColors.inkSoft,
    font: axisFont,
    labelFont,
    grid: { stroke: withAlpha(chartColors.rule, 0.9), width: 1 },
    ticks: { stroke: chartColors.ruleStrong, width: 1, size: 4 },
    border: { show: true, stroke: chartColors.ruleStrong, width: 1 },
    ...axis,
  };
}
