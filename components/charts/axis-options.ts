import type uPlot from "uplot";
import { axisTickLabels, axisUnit, type AxisUnit } from "@/lib/format/axis";
import { themedAxis } from "./chart-theme";

function maxAbsOf(values: ArrayLike<number | null | undefined>): number {
  let max = 0;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (typeof v === "number" && Number.isFinite(v) && Math.abs(v) > max) max = Math.abs(v);
  }
  return max;
}

/** The prefix for an axis covering all of `series`. */
export function unitFor(unit: string, ...series: ArrayLike<number | null | undefined>[]): AxisUnit {
  return axisUnit(Math.max(0, ...series.map(maxAbsOf)), unit);
}

/** A themed axis labelled "Name (prefixed unit)" with ticks in that prefix. */
export function engineeringAxis(name: string, axis: AxisUnit, extra: uPlot.Axis = {}): uPlot.Axis {
  return themedAxis({
    label: `${name} (${axis.unit})`,
    values: (_u, splits, _i, _space, increment) => axisTickLabels(splits, increment, axis),
    ...extra,
  });
}
