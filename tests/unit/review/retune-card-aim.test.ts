import { createElement } from "react";
import { renderToStaticMarkup } from "react-dom/server";
import { describe, expect, it } from "vitest";
import { RetuneCard } from "@/components/review/retune-card";
import { suggestRetune } from "@/lib/oscillator";

// The retune card's aim: which capacitance the suggestion takes as real, and the choice that changes it.

const run = { id: "00000000-0000-4000-8000-000000000001", originalFilename: "capture-1.csv", createdAt: "2026-12-03T10:00:00Z", measuredHz: 1.55e6 };
const tank = { topology: "tank" as const, parts: { L: { valueSi: 10e-6 }, C: { valueSi: 1e-9 } } };
const choose = async () => ({});
const html = (props: Parameters<typeof RetuneCard>[0]) => renderToStaticMarkup(createElement(RetuneCard, props));
const text = (markup: string) => markup.replace(/<[^>]+>/g, " ").replace(/&#x27;/g, "'").replace(/\s+/g, " ");

describe("RetuneCard aim", () => {
  it("says_it_takes_the_lab_s_figure_as_real_and_checks_the_lab_choice", () => {
    const { design: _d, ...s } = suggestRetune(tank, { targetHz: 1.5e6, measuredHz: 1.55e6, calibrationCapacitanceF: 22e-12 });
    const markup = html({ suggestion: s, run, aim: { value: "lab", constructionName: "PCB rev B", fallbackReason: null, choose } });
    expect(text(markup)).toMatch(/taking the \+22\.00 pF that PCB rev B builds add in this lab as real/);
    expect(markup).toMatch(/<input type="radio" name="aim" checked="" value="lab"\/>/);
    expect(markup).toMatch(/<input type="radio" name="aim" value="measured"\/>/);
    expect(text(markup)).toMatch(/Aim for the target/);
  });

  it("keeps_the_build_s_own_run_and_says_why_when_the_lab_has_no_figure", () => {
    const { design: _d, ...s } = suggestRetune(tank, { targetHz: 1.5e6, measuredHz: 1.55e6 });
    const markup = html({ suggestion: s, run, aim: { value: "lab", constructionName: "Perfboard", fallbackReason: "The lab has no steady perfboard build of this topology yet.", choose } });
    expect(text(markup)).toMatch(/taking its implied .* as real/);
    expect(text(markup)).toMatch(/no steady perfboard build/);
  });
});
