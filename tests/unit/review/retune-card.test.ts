import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { RetuneCard, type RetuneView } from "@/components/review/retune-card";
import { suggestRetune, type OscillatorDesign } from "@/lib/oscillator";

// The retune card as a page shows it (issue 15): β and the gain to start before and after, the start-up warning,
// "on target", the unreachable target and the run's trust warnings.

const f0 = (lH: number, cF: number) => 1 / (2 * Math.PI * Math.sqrt(lH * cF));
const run = { id: "00000000-0000-4000-8000-000000000001", originalFilename: "capture-1.csv", createdAt: "2026-12-03T10:00:00Z", measuredHz: null };

function view(design: OscillatorDesign, options: Parameters<typeof suggestRetune>[1]): RetuneView {
  const { design: _design, ...rest } = suggestRetune(design, options);
  return rest;
}

function text(props: Parameters<typeof RetuneCard>[0]): string {
  return renderToStaticMarkup(createElement(RetuneCard, props))
    .replace(/<[^>]+>/g, " ")
    .replace(/&#x27;/g, "'")
    .replace(/\s+/g, " ");
}

const plan = async () => ({});

describe("RetuneCard", () => {
  const colpitts: OscillatorDesign = { topology: "colpitts", parts: { L: { valueSi: 10e-6 }, C1: { valueSi: 10e-9 }, C2: { valueSi: 15e-9 } } };

  it("shows β and the gain to start moving, and warns that C2 15 → 27 nF shrinks the start-up margin", () => {
    // β = C1/C2 (REFERENCES.md §1): 0.667 → 0.37, gain to start 1.5 → 2.7.
    const s = view(colpitts, { targetHz: f0(10e-6, (10e-9 * 27e-9) / 37e-9), part: "C2" });
    const t = text({ suggestion: s, run, plan });
    expect(t).toMatch(/Feedback fraction β 0\.667 → becomes 0\.37/);
    expect(t).toMatch(/Minimum gain to start 1\.5 × → becomes 2\.7 ×/);
    expect(t).toMatch(/Less start-up margin\. C2 15 nF → 27 nF moves the feedback fraction β from 0\.667 to 0\.37/);
    expect(t).toMatch(/Plan this tweak/);
  });

  it("says on target, no tweak needed, and offers nothing to plan", () => {
    const s = view(colpitts, { targetHz: f0(10e-6, 6e-9) * 1.001, targetToleranceHz: f0(10e-6, 6e-9) * 0.01 });
    const t = text({ suggestion: s, run, plan });
    expect(t).toMatch(/On target, no tweak needed/);
    expect(t).not.toMatch(/Plan this tweak/);
    expect(t).not.toMatch(/Predicted after/);
  });

  it("says an unreachable target cannot be reached, with the nearest reachable frequency, and offers nothing to plan", () => {
    const clapp: OscillatorDesign = { topology: "clapp", parts: { L: { valueSi: 100e-6 }, C1: { valueSi: 1e-9 }, C2: { valueSi: 1e-9 }, C3: { valueSi: 100e-12 } } };
    const t = text({ suggestion: view(clapp, { targetHz: 500e3 }), run, plan });
    expect(t).toMatch(/The target cannot be reached with one part\. The nearest reachable frequency is 713\.540 kHz/);
    expect(t).not.toMatch(/Plan this tweak/);
  });

  it("says the suggestion rests on a run with trust warnings", () => {
    const s = view(colpitts, { targetHz: f0(10e-6, (10e-9 * 27e-9) / 37e-9), part: "C2" });
    const t = text({ suggestion: s, run, plan, trustWarnings: ["The waveform is clipped at the top rail."] });
    expect(t).toMatch(/This run carries trust warnings , so the suggestion rests on a measurement that may be off: The waveform is clipped at the top rail\./);
  });
});
