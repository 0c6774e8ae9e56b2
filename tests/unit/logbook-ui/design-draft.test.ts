import { describe, expect, it } from "vitest";
import { draftFields, draftFromRevision, emptyDraft, previewDesign, switchTopology } from "@/components/logbook/design-draft";

function colpittsDraft() {
  const d = emptyDraft("colpitts");
  d.parts.L = { value: "15u", tolerance: "5%", tempco: "" };
  d.parts.C1 = { value: "1n", tolerance: "", tempco: "" };
  d.parts.C2 = { value: "10n", tolerance: "", tempco: "C0G" };
  return d;
}

describe("emptyDraft", () => {
  it("has_every_part_of_the_topology", () => {
    expect(Object.keys(emptyDraft("clapp").parts)).toEqual(["L", "C1", "C2", "C3"]);
    expect(Object.keys(emptyDraft("hartley").parts)).toEqual(["L1", "L2", "C", "M", "k"]);
  });
});

describe("switchTopology", () => {
  it("keeps_shared_parts_and_drops_the_rest", () => {
    const next = switchTopology(colpittsDraft(), "clapp");
    expect(next.parts.L.value).toBe("15u");
    expect(next.parts.C2.tempco).toBe("C0G");
    expect(next.parts.C3.value).toBe("");
    expect(switchTopology(colpittsDraft(), "tank").parts).not.toHaveProperty("C1");
  });
});

describe("previewDesign", () => {
  it("valid_colpitts_predicts_f0", () => {
    const p = previewDesign(colpittsDraft());
    expect(p.problems).toEqual({});
    if (!p.report) throw new Error("expected a report");
    // C_eff = 1n·10n/11n = 0.9091 nF; f0 = 1/(2π√(15 µH · 0.9091 nF)) ≈ 1.3629 MHz (lib/oscillator's own example)
    expect(p.report.predictedHz).toBeCloseTo(1.3629e6, -2);
    expect(p.report.cEffF).toBeCloseTo(1e-9 / 1.1, 15);
    expect(p.report.feedbackFraction).toBeCloseTo(0.1, 12);
    expect(p.report.worstCase.minHz).toBeLessThan(p.report.predictedHz);
  });

  it("missing_values_are_incomplete_not_wrong", () => {
    const p = previewDesign(emptyDraft("tank"));
    expect(p.report).toBeNull();
    expect(p.incomplete).toBe(true);
    expect(Object.keys(p.problems)).toEqual(expect.arrayContaining(["parts.L.value", "parts.C.value"]));
  });

  it("bad_value_is_reported_on_its_field", () => {
    const d = colpittsDraft();
    d.parts.C1.value = "4.7M";
    const p = previewDesign(d);
    expect(p.report).toBeNull();
    expect(p.incomplete).toBe(false);
    expect(p.problems["parts.C1.value"]?.[0]).toMatch(/tolerance letter/);
  });

  it("bad_spec_field_keeps_the_prediction_and_part_problems", () => {
    const d = colpittsDraft();
    d.spec.maxThdPercent = "200";
    const p = previewDesign(d);
    expect(p.report).not.toBeNull();
    expect(p.input).toBeNull();
    expect(p.problems["spec.maxThdPercent"]?.[0]).toMatch(/at most 100/);
    d.parts.C2.value = "abc";
    const q = previewDesign(d);
    expect(q.problems["parts.C2.value"]).toBeDefined();
    expect(q.problems["spec.maxThdPercent"]).toBeDefined();
  });
});

describe("draftFromRevision", () => {
  it("round_trips_through_the_preview", () => {
    const first = previewDesign(colpittsDraft());
    if (!first.input) throw new Error("expected a valid draft");
    const again = draftFromRevision("X", "colpitts", {
      parts: first.input.parts,
      extraCapacitanceF: 2.2e-12,
      windings: null,
      spec: { targetHz: 1.36e6, toleranceValue: 0.5, toleranceUnit: "percent", maxHarmonicDbc: -40 },
    });
    expect(again.parts.L).toEqual({ value: "15 µH", tolerance: "5%", tempco: "" });
    expect(again.parts.C2.tempco).toBe("0 ± 30 ppm/K");
    expect(again.spec.targetHz).toBe("1.36 MHz");
    const second = previewDesign(again);
    expect(second.input).not.toBeNull();
    if (second.input) {
      expect(second.input.parts).toEqual(first.input.parts);
      expect(second.input.extraCapacitanceF).toBeCloseTo(2.2e-12, 24);
      expect(second.input.spec.maxHarmonicDbc).toBe(-40);
    }
  });
});

describe("draftFields", () => {
  it("dotted_names_for_parts_and_spec", () => {
    const names = draftFields(colpittsDraft()).map(([k]) => k);
    expect(names).toEqual(expect.arrayContaining(["parts.C1.value", "parts.L.tolerance", "spec.targetHz", "spec.toleranceUnit"]));
  });
});
