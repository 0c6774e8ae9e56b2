import { describe, expect, it } from "vitest";
import { formDataToObject } from "@/lib/validations/common";
import { designInputSchema, designPatchSchemaFor } from "@/lib/validations/design";
import { runMetadataSchema } from "@/lib/validations/run";
import { tweakInputSchemaFor } from "@/lib/validations/tweak";

function fieldErrors(result: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) {
  return Object.fromEntries((result.error?.issues ?? []).map((i) => [i.path.join("."), i.message]));
}

describe("designInputSchema", () => {
  it("parses_engineering_notation_and_iec_codes_to_si", () => {
    const r = designInputSchema.safeParse({
      name: " Colpitts A ",
      topology: "colpitts",
      parts: { L: { value: "10u", tolerance: "5%" }, C1: { value: "4n7", tolerance: "J", tempco: "C0G" }, C2: { value: "22 nF" } },
      extraCapacitance: "3p3",
      spec: { targetHz: "370k", toleranceValue: "2", toleranceUnit: "percent", maxHarmonicDbc: "-40" },
    });
    expect(r.success).toBe(true);
    const d = r.data!;
    expect(d.name).toBe("Colpitts A");
    expect(d.parts.L.valueSi).toBeCloseTo(10e-6, 18);
    expect(d.parts.L.tolerance).toBeCloseTo(0.05, 12);
    expect(d.parts.C1).toEqual({ valueSi: 4.7e-9, tolerance: 0.05, tempcoPpmPerK: 0, tempcoSpreadPpmPerK: 30 });
    expect(d.parts.C2.valueSi).toBeCloseTo(22e-9, 20);
    expect(d.extraCapacitanceF).toBeCloseTo(3.3e-12, 24);
    expect(d.spec).toMatchObject({ targetHz: 370_000, toleranceValue: 2, maxHarmonicDbc: -40, maxThdPercent: null });
  });

  it("puts_a_bad_value_on_its_part_field_with_the_parser_message", () => {
    const r = designInputSchema.safeParse({ name: "x", topology: "tank", parts: { L: { value: "4.7q" }, C: { value: "1n" } } });
    expect(r.success).toBe(false);
    expect(fieldErrors(r)["parts.L.value"]).toMatch(/"4.7q" is not a value/);
  });

  it("asks_for_a_missing_required_part", () => {
    const r = designInputSchema.safeParse({ name: "x", topology: "clapp", parts: { L: { value: "1u" }, C1: { value: "1n" }, C2: { value: "1n" } } });
    expect(fieldErrors(r)["parts.C3.value"]).toMatch(/Enter the value of C3/);
  });

  it("refuses_a_part_the_topology_does_not_have", () => {
    const r = designInputSchema.safeParse({ name: "x", topology: "tank", parts: { L: { value: "1u" }, C: { value: "1n" }, C9: { value: "1n" } } });
    expect(fieldErrors(r)["parts.C9"]).toMatch(/tank has no part C9/);
  });

  it("drops_a_blank_optional_hartley_coupling", () => {
    const r = designInputSchema.safeParse({
      name: "H",
      topology: "hartley",
      parts: { L1: { value: "22u" }, L2: { value: "2.2u" }, C: { value: "1n" }, M: { value: "" }, k: { value: "0.3" } },
    });
    expect(r.success).toBe(true);
    expect(Object.keys(r.data!.parts).sort()).toEqual(["C", "L1", "L2", "k"]);
    expect(r.data!.parts.k.valueSi).toBeCloseTo(0.3, 12);
  });

  it("ignores_windings_posted_for_a_topology_without_them", () => {
    const r = designInputSchema.safeParse({ name: "x", topology: "tank", windings: "aiding", parts: { L: { value: "1u" }, C: { value: "1n" } } });
    expect(r.success).toBe(true);
    expect(r.data!.windings).toBeNull();
  });

  it("needs_a_target_for_a_tolerance", () => {
    const r = designInputSchema.safeParse({ name: "x", topology: "tank", parts: { L: { value: "1u" }, C: { value: "1n" } }, spec: { toleranceValue: "1" } });
    expect(fieldErrors(r)["spec.targetHz"]).toMatch(/needs a target/);
  });

  it("refuses_a_positive_harmonic_limit", () => {
    const r = designInputSchema.safeParse({ name: "x", topology: "tank", parts: { L: { value: "1u" }, C: { value: "1n" } }, spec: { maxHarmonicDbc: "40" } });
    expect(fieldErrors(r)["spec.maxHarmonicDbc"]).toMatch(/at most 0/);
  });
});

describe("designPatchSchemaFor", () => {
  it("parses_only_the_parts_given_and_clears_extra_capacitance", () => {
    const r = designPatchSchemaFor("colpitts").safeParse({ parts: { C2: { value: "27n" } }, extraCapacitance: "" });
    expect(r.success).toBe(true);
    expect(r.data!.parts).toEqual({ C2: { valueSi: 27e-9 } });
    expect(r.data!.extraCapacitanceF).toBeNull();
    expect(r.data!.spec).toBeUndefined();
  });
});

describe("tweakInputSchemaFor", () => {
  it("parses_the_new_value_in_the_part_unit", () => {
    const r = tweakInputSchemaFor("colpitts").safeParse({ partRef: "C2", toValue: "18n", note: "" });
    expect(r.data).toEqual({ partRef: "C2", toValue: 18e-9, note: "", planned: false });
  });

  it("accepts_a_note_alone", () => {
    const r = tweakInputSchemaFor("tank").safeParse({ partRef: "", toValue: "", note: "moved the probe ground" });
    expect(r.data).toEqual({ partRef: null, toValue: null, note: "moved the probe ground", planned: false });
  });

  it("refuses_an_empty_tweak", () => {
    expect(fieldErrors(tweakInputSchemaFor("tank").safeParse({}))["note"]).toMatch(/Say what changed/);
  });

  it("refuses_a_capacitor_with_a_tolerance_letter_as_multiplier", () => {
    expect(fieldErrors(tweakInputSchemaFor("tank").safeParse({ partRef: "C", toValue: "10K" }))["toValue"]).toMatch(/tolerance letter/);
  });
});

describe("runMetadataSchema", () => {
  it("reads_probe_forms_and_blank_numbers", () => {
    const r = runMetadataSchema.safeParse({ probe: "10x", supplyV: "", temperatureC: "23,5", note: "after C2 swap" });
    expect(r.data).toMatchObject({ probe: 10, supplyV: undefined, temperatureC: 23.5, note: "after C2 swap", keepDuplicate: false });
    expect(runMetadataSchema.parse({ probe: "10:1" }).probe).toBe(10);
    expect(runMetadataSchema.parse({}).probe).toBe(1);
  });

  it("refuses_a_non_numeric_supply", () => {
    expect(fieldErrors(runMetadataSchema.safeParse({ supplyV: "twelve" }))["supplyV"]).toMatch(/must be a number/);
  });
});

describe("formDataToObject", () => {
  it("nests_dotted_names_and_ignores_prototype_keys", () => {
    const form = new FormData();
    form.set("name", "A");
    form.set("parts.C1.value", "4n7");
    form.set("__proto__.polluted", "yes");
    const o = formDataToObject(form);
    expect(o).toEqual({ name: "A", parts: { C1: { value: "4n7" } } });
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });
});
