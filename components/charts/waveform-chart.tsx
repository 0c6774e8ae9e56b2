"use client";

import { useEffect, useMemo, useRef, useState } from "react";
import type uPlot from "uplot";
import { fetchJson } from "@/components/providers/query-provider";
import { Button } from "@/components/ui/button";
import { formatQuantity } from "@/lib/format/numbers";
import { chartColors, withAlpha } from "./chart-theme";
import { engineeringAxis, unitFor } from "./axis-options";
import { UPlotChart } from "./uplot-chart";
import { wantsRawSamples, type WaveformExcerpt } from "./waveform-samples";

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
  /** The capture's sample rate, S/s: with `excerptUrl`, a deep zoom fetches and draws the samples themselves. */
  sampleRateHz?: number | null;
  /** GET route answering `?fromS=&toS=` with `{timeS, volts}` (the run's excerpt route). */
  excerptUrl?: string;
  /** A start-up's or ring-down's fitted envelope (DC ± the fundamental's amplitude per period), drawn over the band. */
  envelope?: { timeS: number[]; amplitudeVpk: number[]; dcV: number; kind: "start-up" | "ring-down" } | null;
}

type Excerpt = { state: "none" } | { state: "loading"; fromS: number; toS: number } | { state: "ready"; excerpt: WaveformExcerpt } | { state: "error"; message: string };

// How long the zoom must rest before the samples are fetched, so a drag across the plot sends one request.
const FETCH_DELAY_MS = 250;

/**
 * The capture's waveform as a min/max envelope: every sample is inside the shaded band, so a glitch or a clipped
 * peak shows even when the record has millions of samples. Zoomed in far enough (a few thousand samples in view),
 * it fetches that window's raw samples from the stored capture and draws them, each sample a point.
 */
export function WaveformChart({ timeS, minV, maxV, channel, height = 240, sampleRateHz, excerptUrl, envelope }: WaveformChartProps) {
  const [excerpt, setExcerpt] = useState<Excerpt>({ state: "none" });
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);
  const abort = useRef<AbortController | null>(null);

  useEffect(
    () => () => {
      if (timer.current) clearTimeout(timer.current);
      abort.current?.abort();
    },
    [],
  );

  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const x = unitFor("s", timeS);
    const y = unitFor("V", minV, maxV);
    const onZoom = (u: uPlot, key: string) => {
      if (key !== "x" || !excerptUrl) return;
      const fromS = u.scales.x.min;
      const toS = u.scales.x.max;
      if (timer.current) clearTimeout(timer.current);
      if (fromS == null || toS == null || !wantsRawSamples(fromS, toS, sampleRateHz)) return;
      timer.current = setTimeout(() => {
        abort.current?.abort();
        const controller = new AbortController();
        abort.current = controller;
        setExcerpt({ state: "loading", fromS, toS });
        fetchJson<{ timeS: number[]; volts: number[] }>(`${excerptUrl}?fromS=${fromS}&toS=${toS}`, controller.signal)
          .then((body) => setExcerpt({ state: "ready", excerpt: { fromS, toS, timeS: body.timeS, volts: body.volts } }))
          .catch((err: unknown) => {
            if (controller.signal.aborted) return;
            setExcerpt({ state: "error", message: err instanceof Error ? err.message : "The samples could not be loaded." });
          });
      }, FETCH_DELAY_MS);
    };
    const fitted: uPlot.Series[] = envelope
      ? [
          { label: "fitted envelope +", stroke: chartColors.traceC, width: 1.5, dash: [5, 3], points: { show: false } },
          { label: "fitted envelope −", stroke: chartColors.traceC, width: 1.5, dash: [5, 3], points: { show: false } },
        ]
      : [];
    return {
      scales: { x: { time: false }, y: { auto: true } },
      axes: [engineeringAxis("Time", x), engineeringAxis("Voltage", y, { size: 56 })],
      series: [
        {},
        { label: "max", stroke: chartColors.traceA, width: 1, points: { show: false } },
        { label: "min", stroke: chartColors.traceA, width: 1, points: { show: false } },
        ...fitted,
      ],
      bands: [{ series: [1, 2], fill: withAlpha(chartColors.traceA, 0.22) }],
      hooks: { setScale: [onZoom] },
    };
  }, [timeS, minV, maxV, excerptUrl, sampleRateHz, envelope]);
  const data = useMemo<uPlot.AlignedData>(() => {
    if (!envelope) return [timeS, maxV, minV];
    const amplitude = timeS.map((t) => envelopeAt(envelope.timeS, envelope.amplitudeVpk, t));
    return [
      timeS,
      maxV,
      minV,
      amplitude.map((a) => (a === null ? null : envelope.dcV + a)),
      amplitude.map((a) => (a === null ? null : envelope.dcV - a)),
    ];
  }, [timeS, minV, maxV, envelope]);

  const name = channel ? `channel ${channel}` : "the analysed channel";
  if (excerpt.state === "ready") {
    return <SamplesChart excerpt={excerpt.excerpt} name={name} height={height} onBack={() => setExcerpt({ state: "none" })} />;
  }
  return (
    <div className="space-y-2">
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
              <span>t {formatQuantity(timeS[i], "s", 6)}</span>
              <span>max {formatQuantity(maxV[i], "V", 4)}</span>
              <span>min {formatQuantity(minV[i], "V", 4)}</span>
            </span>
          )
        }
        legend={
          <p className="flex items-center gap-2">
            <span aria-hidden="true" className="inline-block h-3 w-5 rounded-sm" style={{ background: withAlpha(chartColors.traceA, 0.35), border: `1px solid ${chartColors.traceA}` }} />
            Envelope of {name}: the band spans the lowest and highest sample in each time slice.
            {envelope ? ` The dashed lines are the ${envelope.kind}'s fitted envelope, DC ± the fundamental's amplitude per period.` : ""}
            {excerptUrl && sampleRateHz ? " Zoom in to a few thousand samples to see the samples themselves." : ""}
          </p>
        }
      />
      {excerpt.state === "loading" ? (
        <p role="status" className="text-xs text-ink-soft">
          Loading the samples from {formatQuantity(excerpt.fromS, "s", 6)} to {formatQuantity(excerpt.toS, "s", 6)}…
        </p>
      ) : excerpt.state === "error" ? (
        <p role="alert" className="text-xs text-verdict-fail">
          {excerpt.message}
        </p>
      ) : null}
    </div>
  );
}

/** The envelope's amplitude at time t, linear between its per-period points; null outside them (not drawn, not guessed). */
function envelopeAt(timesS: number[], amplitudeVpk: number[], t: number): number | null {
  const last = timesS.length - 1;
  if (last < 1 || t < timesS[0] || t > timesS[last]) return null;
  let lo = 0;
  let hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (timesS[mid] <= t) lo = mid;
    else hi = mid;
  }
  const span = timesS[hi] - timesS[lo];
  const w = span > 0 ? (t - timesS[lo]) / span : 0;
  return amplitudeVpk[lo] + w * (amplitudeVpk[hi] - amplitudeVpk[lo]);
}

/** The raw samples of a zoomed window: a line through every sample, each marked, with a way back to the record. */
function SamplesChart({ excerpt, name, height, onBack }: { excerpt: WaveformExcerpt; name: string; height: number; onBack: () => void }) {
  const { timeS, volts } = excerpt;
  const data = useMemo<uPlot.AlignedData>(() => [timeS, volts], [timeS, volts]);
  const options = useMemo<Omit<uPlot.Options, "width" | "height">>(() => {
    const x = unitFor("s", timeS);
    const y = unitFor("V", volts);
    return {
      scales: { x: { time: false }, y: { auto: true } },
      axes: [engineeringAxis("Time", x), engineeringAxis("Voltage", y, { size: 56 })],
      series: [{}, { label: "sample", stroke: chartColors.traceA, width: 1, points: { show: timeS.length <= 600, size: 4, fill: chartColors.traceA } }],
    };
  }, [timeS, volts]);
  return (
    <div className="space-y-2">
      <UPlotChart
        options={options}
        data={data}
        height={height}
        label={`Samples of ${name} from ${formatQuantity(excerpt.fromS, "s", 6)} to ${formatQuantity(excerpt.toS, "s", 6)}`}
        readout={(i) =>
          i === null || timeS[i] === undefined ? (
            <span className="text-ink-faint">Move over the plot to read values</span>
          ) : (
            <span className="flex flex-wrap gap-x-3">
              <span>t {formatQuantity(timeS[i], "s", 8)}</span>
              <span>{formatQuantity(volts[i], "V", 4)}</span>
            </span>
          )
        }
        legend={
          <p data-testid="waveform-samples">
            {timeS.length} samples of {name}, as stored in the capture (probe attenuation applied).
          </p>
        }
      />
      <Button size="sm" variant="secondary" onClick={onBack}>
        Back to the whole record
      </Button>
    </div>
  );
}
