import { describe, expect, it } from "vitest";
import { designInputSchema, designSpecSchema, everyDesignIssue } from "@/lib/validations/design";
import { limitedNumber } from "@/lib/validations/limits";
import { tweakInputSchemaFor } from "@/lib/validations/tweak";
import { toleranceField, tempcoField } from "@/lib/validations/common";

function fieldErrors(result: { success: boolean; error?: { issues: { path: PropertyKey[]; message: string }[] } }) {
  return Object.fromEntries((result.error?.issues ?? []).map((i) => [i.path.join("."), i.message]));
}

const colpitts = (parts: Record<string, { value: string | number; tolerance?: string }>, spec: Record<string, string> = {}) => ({
  name: "Limits",
  topology: "colpitts",
  parts,
  spec,
});

describe("bench limits in the design schema (the form and the API)", () => {
  it("refuses L = 1e30 H and L = C = 1f on the field, in engineering notation with the unit", () => {
    const huge = designInputSchema.safeParse(colpitts({ L: { value: 1e30 }, C1: { value: "1n" }, C2: { value: "4n7" } }));
    expect(fieldErrors(huge)["parts.L.value"]).toBe("Part L (tank inductor) must be from 1 nH to 10 H; got 1e30 H.");
    const femto = designInputSchema.safeParse({ name: "f", topology: "tank", parts: { L: { value: "1f" }, C: { value: "1f" } }, spec: {} });
    const errors = fieldErrors(femto);
    expect(errors["parts.L.value"]).toMatch(/got 1 fH\.$/);
    expect(errors["parts.C.value"]).toMatch(/from 100 fF to 10 mF; got 1 fF\.$/);
  });

  it("refuses a target of 1e30 Hz on spec.targetHz", () => {
    const r = designSpecSchema.safeParse({ targetHz: "1e30" });
    expect(fieldErrors(r).targetHz).toBe("The target frequency must be from 100 mHz to 20 GHz; got 1e30 Hz.");
    expect(designSpecSchema.safeParse({ targetHz: "412,3k" }).data?.targetHz).toBe(412_300);
  });

  it("accepts decimal commas in part values as the CSV importer does", () => {
    const r = designInputSchema.safeParse(colpitts({ L: { value: "10u" }, C1: { value: "4,7nF" }, C2: { value: "2,2 nF", tolerance: "2,5%" } }));
    expect(r.success).toBe(true);
    expect(r.data!.parts.C1.valueSi).toBe(4.7e-9);
    expect(r.data!.parts.C2.valueSi).toBe(2.2e-9);
    expect(r.data!.parts.C2.tolerance).toBe(0.025);
  });

  it("refuses a tolerance above 50 % and a tempco past ±10 000 ppm/K", () => {
    expect(toleranceField.safeParse("60%").error?.issues[0].message).toBe("The tolerance must be from 0 % to 50 %; got 60 %.");
    expect(toleranceField.safeParse(0.05).data).toBe(0.05);
    expect(tempcoField.safeParse("N47000").error?.issues[0].message).toBe("The tempco must be from -10000 ppm/K to 10000 ppm/K; got -47000 ppm/K.");
  });

  it("lists every problem of a form at once", () => {
    const raw = { ...colpitts({ L: { value: "1e30" }, C1: { value: "1f" }, C2: { value: "banana" } }, { targetHz: "1e30" }), name: "" };
    const r = designInputSchema.safeParse(raw);
    // The schema alone stops at the first failing object…
    expect(Object.keys(fieldErrors(r)).length).toBeLessThan(5);
    // …so the form's action merges the parts, the spec and the name checked apart.
    const every = everyDesignIssue(raw, r.error!);
    const errors = fieldErrors({ success: false, error: every });
    expect(Object.keys(errors).sort()).toEqual(["name", "parts.C1.value", "parts.C2.value", "parts.L.value", "spec.targetHz"]);
    expect(errors["parts.L.value"]).toMatch(/got 1e30 H\.$/);
    expect(every.issues.length).toBe(new Set(every.issues.map((i) => `${i.path.join(".")}|${i.message}`)).size);
  });
});

describe("bench limits in the tweak schema", () => {
  const schema = tweakInputSchemaFor("colpitts");

  it("refuses C2 = 1e30 F with the value in engineering notation", () => {
    const r = schema.safeParse({ partRef: "C2", toValue: 1e30 });
    expect(fieldErrors(r).toValue).toBe("The new value of C2 must be from 100 fF to 10 mF; got 1e30 F.");
    expect(fieldErrors(schema.safeParse({ partRef: "C2", toValue: "1e30" })).toValue).toMatch(/not a value|1e30 F/);
  });

  it("accepts a plausible value, with a decimal comma", () => {
    expect(schema.safeParse({ partRef: "C2", toValue: "27n" }).data?.toValue).toBe(27e-9);
    expect(schema.safeParse({ partRef: "C2", toValue: "2,7n" }).data?.toValue).toBe(2.7e-9);
  });

  it("keeps the coupling coefficient between 0 and 1", () => {
    const r = tweakInputSchemaFor("hartley").safeParse({ partRef: "k", toValue: "1.5" });
    expect(fieldErrors(r).toValue).toMatch(/coupling coefficient\) must be a number from 0 to 1; got 1.5/);
  });
});

describe("limitedNumber", () => {
  it("is one rule per quantity, the same words everywhere", () => {
    const rule = limitedNumber("temperatureChangeK", "the temperature change");
    expect(rule.safeParse(-2000).error?.issues[0].message).toBe(
      "The temperature change must be above -298.15 K and up to 500 K; got -2000 K (that is at or below absolute zero).",
    );
    expect(rule.safeParse(40).success).toBe(true);
  });
});
