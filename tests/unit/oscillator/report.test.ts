import { describe, expect, it } from "vitest";
import { buildDesignReport, predictOscillator } from "@/lib/oscillator";
import { design, expectRel } from "./expect-close";

describe("buildDesignReport", () => {
  const d = design("colpitts", { L: 100e-6, C1: 1e-9, C2: 4.7e-9 }, { L: 0.1, C1: 0.05, C2: 0.05 });

  it("holds the prediction and both bands", () => {
    const r = buildDesignReport(d);
    expectRel(r.predictedHz, predictOscillator(d).predictedHz, 1e-15);
    expect(r.worstCase.minHz).toBeLessThan(r.statistical.minHz);
    expect(r.statistical.maxHz).toBeLessThan(r.worstCase.maxHz);
    expect(r.drift).toBeUndefined();
    expect(r.retune).toBeUndefined();
  });

  it("adds drift and retune when asked, and stays JSON-serialisable", () => {
    const r = buildDesignReport(d, { measuredHz: 412.3e3, targetHz: 400e3, series: "E24" });
    expect(r.drift?.hz).toBeLessThan(0);
    expect(r.retune?.series).toBe("E24");
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
  });
});
