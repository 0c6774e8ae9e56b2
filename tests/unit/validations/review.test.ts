import { describe, expect, it } from "vitest";
import { acceptReasonSchema, buildReviewInputSchema, buildTableQuerySchema, retunePlanSchema, runExportQuerySchema } from "@/lib/validations/review";

describe("buildReviewInputSchema", () => {
  it("takes_the_api_decision_or_the_forms_status", () => {
    expect(buildReviewInputSchema.parse({ decision: "accept", reason: " known H2 " })).toEqual({ decision: "accept", reason: "known H2" });
    expect(buildReviewInputSchema.parse({ status: "accepted" })).toEqual({ decision: "accept" });
    expect(buildReviewInputSchema.parse({ status: "open", comment: "" })).toEqual({ decision: "reopen" });
  });

  it("a_rejection_needs_a_comment", () => {
    const r = buildReviewInputSchema.safeParse({ decision: "reject", comment: "  " });
    expect(r.success).toBe(false);
    expect(r.error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([["comment", "Say why the build is rejected."]]);
  });

  it("an_unknown_decision_is_refused_with_the_choices", () => {
    const r = buildReviewInputSchema.safeParse({ decision: "sign" });
    expect(r.error?.issues[0].message).toBe("The decision is accept, reject or reopen.");
  });
});

describe("acceptReasonSchema", () => {
  it("refuses_blank_and_trims", () => {
    expect(acceptReasonSchema.safeParse("   ").success).toBe(false);
    expect(acceptReasonSchema.parse("  filtered later ")).toBe("filtered later");
    expect(acceptReasonSchema.safeParse("x".repeat(2001)).success).toBe(false);
  });
});

describe("buildTableQuerySchema", () => {
  it("parses_a_query_string_with_a_state_list", () => {
    expect(buildTableQuerySchema.parse({ q: "BB", state: "flagged, in-spec", sort: "thdPercent", dir: "asc", page: "2", pageSize: "50" })).toEqual({
      q: "BB",
      state: ["flagged", "in-spec"],
      sort: "thdPercent",
      dir: "asc",
      page: 2,
      pageSize: 50,
    });
    expect(buildTableQuerySchema.parse({ state: "", sort: "", page: "" })).toEqual({});
  });

  it("refuses_unknown_states_sorts_and_page_sizes", () => {
    expect(buildTableQuerySchema.safeParse({ state: "broken" }).success).toBe(false);
    expect(buildTableQuerySchema.safeParse({ sort: "colour" }).success).toBe(false);
    expect(buildTableQuerySchema.safeParse({ pageSize: "500" }).success).toBe(false);
  });
});

describe("runExportQuerySchema", () => {
  it("keeps_the_runs_table_filters_and_ignores_paging", () => {
    const out = runExportQuerySchema.parse({ verdict: "fail", from: "2026-12-01T00:00:00Z", cursor: "abc", limit: "5" });
    expect(out).toEqual({ verdict: "fail", from: new Date("2026-12-01T00:00:00Z") });
  });
});

describe("retunePlanSchema", () => {
  it("takes_an_optional_e_series", () => {
    const buildId = "0b6f1f8e-9d1c-4a55-9a43-3c2e2f0e8a11";
    expect(retunePlanSchema.parse({ buildId, series: "" })).toEqual({ buildId });
    expect(retunePlanSchema.parse({ buildId, series: "E24" })).toEqual({ buildId, series: "E24" });
    expect(retunePlanSchema.safeParse({ buildId, series: "E7" }).success).toBe(false);
  });
});
