import { describe, expect, it } from "vitest";
import { caseInsensitivePattern, normaliseDocument } from "@/lib/openapi/normalise";

const UUID = "^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$";

describe("caseInsensitivePattern", () => {
  it("matches_upper_and_lower_case_uuids_like_the_i_flag_does", () => {
    const rewritten = new RegExp(caseInsensitivePattern(UUID));
    const flagged = new RegExp(UUID, "i");
    for (const id of ["3f2b8c1e-5d4a-4e6b-9a7c-1d2e3f4a5b6c", "3F2B8C1E-5D4A-4E6B-9A7C-1D2E3F4A5B6C", "3f2B8c1E-5d4A-4e6B-9a7C-1d2E3f4A5b6C", "3f2b8c1e5d4a4e6b9a7c1d2e3f4a5b6c", "3g2b8c1e-5d4a-4e6b-9a7c-1d2e3f4a5b6c"]) {
      expect(rewritten.test(id), id).toBe(flagged.test(id));
    }
  });

  it("doubles_literal_letters_and_class_letters_but_leaves_escapes_and_negation", () => {
    expect(caseInsensitivePattern("ab")).toBe("[aA][bB]");
    expect(caseInsensitivePattern("[x-z_]")).toBe("[x-zX-Z_]");
    expect(caseInsensitivePattern("[^a]\\d\\x41")).toBe("[^aA]\\d\\x41");
  });

  it("leaves_named_groups_and_property_escapes_unchanged", () => {
    expect(caseInsensitivePattern("(?<id>a)")).toBe("(?<id>a)");
    expect(caseInsensitivePattern("\\p{L}")).toBe("\\p{L}");
  });
});

describe("normaliseDocument", () => {
  it("turns_a_nullable_allOf_reference_into_anyOf_with_null", () => {
    const doc = { a: { allOf: [{ $ref: "#/components/schemas/X" }, { type: ["object", "null"] }], description: "d" } };
    normaliseDocument(doc);
    expect(doc.a).toEqual({ anyOf: [{ $ref: "#/components/schemas/X" }, { type: "null" }], description: "d" });
  });

  it("keeps_an_allOf_that_adds_more_than_nullability", () => {
    const doc = { a: { allOf: [{ $ref: "#/components/schemas/X" }, { type: ["object", "null"], description: "more" }] } };
    normaliseDocument(doc);
    expect(doc.a.allOf).toHaveLength(2);
  });

  it("drops_regex_flags_from_patterns_spelling_out_i", () => {
    const doc = { p: { pattern: "^ab$/i" }, q: { pattern: "^a\\/i" }, r: { pattern: "^x$/u" } };
    normaliseDocument(doc);
    expect(doc).toEqual({ p: { pattern: "^[aA][bB]$" }, q: { pattern: "^a\\/i" }, r: { pattern: "^x$" } });
  });
});
