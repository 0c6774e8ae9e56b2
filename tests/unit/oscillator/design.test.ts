import { describe, expect, it } from "vitest";
import { assertValidDesign, nominalValues, parallelCapacitanceF, partUnit, validateDesign } from "@/lib/oscillator";
import { design } from "./expect-close";

describe("validateDesign", () => {
  it("accepts a complete design", () => {
    expect(validateDesign(design("clapp", { L: 1e-4, C1: 1e-9, C2: 1e-9, C3: 1e-10 }, { C1: 0.05 }))).toEqual([]);
    expect(validateDesign(design("hartley", { L1: 1e-6, L2: 1e-6, C: 1e-9, k: 0.3 }))).toEqual([]);
  });

  it("names a missing part with its role and unit", () => {
    expect(validateDesign(design("colpitts", { L: 1e-4, C1: 1e-9 }))).toEqual([
      "colpitts needs part C2 (divider capacitor on the input (base/gate) side, F)",
    ]);
  });

  it("refuses negative, zero and non-finite values", () => {
    const problems = validateDesign(design("clapp", { L: -1e-6, C1: 0, C2: Number.NaN, C3: Number.POSITIVE_INFINITY }));
    expect(problems).toHaveLength(4);
    // Engineering notation with the unit, never a raw float (issue 12 item 9).
    expect(problems[0]).toBe("part L (tank inductor) must be from 1 nH to 10 H; got -1 µH");
    expect(problems[1]).toMatch(/^part C1 .* must be from 100 fF to 10 mF; got 0 F$/);
    expect(problems[2]).toMatch(/part C2 .* got NaN/);
    expect(problems[3]).toMatch(/part C3 .* got Infinity/);
    expect(validateDesign({ topology: "tank", parts: { L: { valueSi: "1u" }, C: { valueSi: 1e-9 } } })[0]).toMatch(
      /part L .* got "1u"/,
    );
  });

  it("refuses parts the topology does not use", () => {
    expect(validateDesign(design("tank", { L: 1e-6, C: 1e-9, C3: 1e-9 }))).toEqual([
      "part C3 is not used by tank (its parts are L, C)",
    ]);
  });

  it("refuses tolerances and tempcos out of range", () => {
    expect(validateDesign(design("tank", { L: 1e-6, C: 1e-9 }, { C: 5 }))[0]).toMatch(/tolerance must be from 0 % to 50 %; got 500 %/);
    const bad = { topology: "tank", parts: { L: { valueSi: 1e-6, tempcoPpmPerK: Number.NaN }, C: { valueSi: 1e-9, tempcoSpreadPpmPerK: -1 } } };
    expect(validateDesign(bad)).toHaveLength(2);
  });

  it("checks the Hartley coupling", () => {
    expect(validateDesign(design("hartley", { L1: 1e-6, L2: 1e-6, C: 1e-9, M: 1e-7, k: 0.1 }))).toContain(
      "hartley takes M or k, not both",
    );
    expect(validateDesign(design("hartley", { L1: 1e-6, L2: 1e-6, C: 1e-9, k: 1.2 }))[0]).toMatch(/from 0 to 1; got 1.2/);
    expect(validateDesign(design("hartley", { L1: 1e-6, L2: 4e-6, C: 1e-9, M: 3e-6 }))[0]).toMatch(/must not exceed √\(L1·L2\)/);
    expect(
      validateDesign({ ...design("hartley", { L1: 1e-6, L2: 1e-6, C: 1e-9, k: 1 }), windings: "opposing" })[0],
    ).toMatch(/cancel completely/);
    expect(validateDesign({ ...design("tank", { L: 1e-6, C: 1e-9 }), windings: "aiding" })[0]).toMatch(/hartley only/);
  });

  it("refuses a negative extra capacitance and a bad shape", () => {
    expect(validateDesign(design("tank", { L: 1e-6, C: 1e-9 }, {}, -3e-12))[0]).toMatch(/extraCapacitanceF .* from 0 F to 1 µF; got -3 pF/);
    expect(validateDesign(null)).toEqual(["a design must be an object; got null"]);
    expect(validateDesign({ topology: "pierce", parts: {} })[0]).toMatch(/topology must be one of tank, colpitts, hartley, clapp/);
    expect(validateDesign({ topology: "tank", parts: [] })[0]).toMatch(/parts must be an object/);
  });
});

describe("assertValidDesign", () => {
  it("throws a RangeError with every problem", () => {
    expect(() => assertValidDesign(design("colpitts", { L: 1e-6 }))).toThrow(/needs part C1.*; colpitts needs part C2/);
  });
});

describe("partUnit", () => {
  it("gives the unit of each part", () => {
    expect(partUnit("hartley", "M")).toBe("H");
    expect(partUnit("hartley", "k")).toBe("");
    expect(partUnit("clapp", "C3")).toBe("F");
    expect(() => partUnit("tank", "C1")).toThrow(/not used by tank/);
  });
});

describe("nominalValues", () => {
  it("maps references to values", () => {
    expect(nominalValues(design("tank", { L: 1e-6, C: 1e-9 }))).toEqual({ L: 1e-6, C: 1e-9 });
  });
});

describe("parallelCapacitanceF", () => {
  it("adds extra and calibration capacitance", () => {
    expect(parallelCapacitanceF({ ...design("tank", { L: 1e-6, C: 1e-9 }, {}, 3e-12), calibrationCapacitanceF: -1e-12 })).toBeCloseTo(2e-12, 20);
  });
});
