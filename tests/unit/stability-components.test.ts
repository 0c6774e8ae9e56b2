import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { StabilityComparison } from "@/components/logbook/stability/stability-comparison";
import { StabilityFigures } from "@/components/logbook/stability/stability-figures";
import { analyzeSamples } from "@/lib/analysis";
import { SeededRandom } from "../helpers/signals";
import { bandLimitedPhase, FS, N, toneWithPhase } from "./stability-signals";

// The stability figures as the run and compare pages print them: ≤ at the floor, figures where measured, "not
// measured" with a reason where not, and an older engine's run read as such.

function text(element: Parameters<typeof renderToStaticMarkup>[0]): string {
  return renderToStaticMarkup(element).replace(/<[^>]+>/g, " ").replace(/&#x27;/g, "'").replace(/\s+/g, " ");
}

const clean = analyzeSamples(toneWithPhase(new Float64Array(N), 1e-3, new SeededRandom(1601)), FS, { plot: false }).result;
const noisy = analyzeSamples(toneWithPhase(bandLimitedPhase(N, FS, 10e3, 3e-3, new SeededRandom(1602)), 1e-4, new SeededRandom(1603)), FS, { plot: false }).result;

describe("StabilityFigures", () => {
  it("prints a clean tone's jitter and period jitter as ≤ its floor", () => {
    const t = text(createElement(StabilityFigures, { stability: clean.stability! }));
    expect(t).toMatch(/rms phase jitter ≤ \d/);
    expect(t).toMatch(/Period jitter \(rms\) ≤ \d/);
    expect(t).toMatch(/At the capture's noise floor/);
  });

  it("prints a measured jitter without ≤", () => {
    const t = text(createElement(StabilityFigures, { stability: noisy.stability! }));
    expect(t).toMatch(/rms phase jitter \d[\d.]* [pn]s/);
    expect(t).not.toMatch(/rms phase jitter ≤/);
  });
});

describe("StabilityComparison", () => {
  it("sets both runs side by side and reads an older engine's run as not measured", () => {
    const old = { ...JSON.parse(JSON.stringify(noisy)), engineVersion: "1.2.0", stability: undefined };
    const t = text(createElement(StabilityComparison, { a: { label: "A · old.csv", results: old }, b: { label: "B · new.csv", results: noisy } }));
    expect(t).toMatch(/rms phase jitter not measured \(older engine\) \d/);
    expect(t).toMatch(/𝓛 at 1 kHz not measured \(older engine\) −\d+\.\d dBc\/Hz/);
  });

  it("says so when neither run has figures", () => {
    const t = text(createElement(StabilityComparison, { a: { label: "A", results: { engineVersion: "1.2.0" } }, b: { label: "B", results: null } }));
    expect(t).toMatch(/Neither run has stability figures/);
  });
});
