import { describe, expect, it } from "vitest";
import { compareRules, renderFlagEmail, ruleLabel, type FlagEmailInput } from "@/lib/alerts/flag-email";

function input(over: Partial<FlagEmailInput> = {}): FlagEmailInput {
  return {
    build: { label: "BB-3", designName: "Clapp 7 MHz", projectName: "VFO" },
    run: { originalFilename: "after-c3-swap.csv", createdAt: new Date("2026-12-01T09:30:12Z"), createdByName: "Ana", checkCount: 5 },
    newFlags: [{ rule: "harmonic-2", message: "Harmonic 2 at −31.0 dBc against a maximum of −40 dBc: outside by 9.0 dB." }],
    stillFailing: [],
    runUrl: "http://127.0.0.1:3000/runs/0b6f1f8e-9d1c-4a55-9a43-3c2e2f0e8a11",
    reason: "maker",
    ...over,
  };
}

describe("ruleLabel", () => {
  it("names_each_rule_in_words", () => {
    expect(["frequency", "thd", "harmonic-3", "amplitude", "in-record-drift", "warning-clipping", "warning-not-steady"].map(ruleLabel)).toEqual([
      "frequency",
      "THD",
      "harmonic 3",
      "amplitude",
      "in-record drift",
      "clipping",
      "not steady",
    ]);
  });
});

describe("compareRules", () => {
  it("orders_numbers_inside_rule_names_by_value", () => {
    expect(["harmonic-10", "thd", "harmonic-2", "frequency", "harmonic-1"].sort(compareRules)).toEqual(["frequency", "harmonic-1", "harmonic-2", "harmonic-10", "thd"]);
  });
});

describe("renderFlagEmail", () => {
  it("subject_names_the_build_design_and_new_rules", () => {
    const mail = renderFlagEmail(input({ newFlags: [{ rule: "thd", message: "a" }, { rule: "harmonic-2", message: "b" }] }));
    expect(mail.subject).toBe("Spec flag on BB-3 (Clapp 7 MHz): harmonic 2, THD");
  });

  it("subject_and_lists_put_harmonic_2_before_harmonic_10", () => {
    const flags = ["harmonic-10", "harmonic-3", "harmonic-2"].map((rule) => ({ rule, message: `${rule} too high` }));
    const mail = renderFlagEmail(input({ newFlags: flags, stillFailing: ["harmonic-12", "harmonic-9"] }));
    expect(mail.subject).toBe("Spec flag on BB-3 (Clapp 7 MHz): harmonic 2, harmonic 3, harmonic 10");
    expect(mail.text.indexOf("• harmonic 2:")).toBeLessThan(mail.text.indexOf("• harmonic 10:"));
    expect(mail.text).toContain("Still failing, already reported: harmonic 9, harmonic 12.");
  });

  it("text_has_the_verdict_the_rule_messages_the_utc_time_and_the_link", () => {
    const mail = renderFlagEmail(input({ stillFailing: ["thd"] }));
    expect(mail.text).toContain("failed its spec: 2 of 5 checks failed");
    expect(mail.text).toContain("logged by Ana on 2026-12-01 09:30 UTC");
    expect(mail.text).toContain("• harmonic 2: Harmonic 2 at −31.0 dBc");
    expect(mail.text).toContain("Still failing, already reported: THD.");
    expect(mail.text).toContain("Open the run: http://127.0.0.1:3000/runs/0b6f1f8e-9d1c-4a55-9a43-3c2e2f0e8a11");
    expect(mail.text).toContain("you created or built this build");
  });

  it("escapes_user_text_in_the_html_part", () => {
    const mail = renderFlagEmail(input({ build: { label: '<img src=x onerror="alert(1)">', designName: "A & B", projectName: "P" } }));
    expect(mail.html).not.toContain("<img src=x");
    expect(mail.html).toContain("&lt;img src=x onerror=&quot;alert(1)&quot;&gt;");
    expect(mail.html).toContain("A &amp; B");
  });

  it("refuses_a_link_that_is_not_http", () => {
    expect(() => renderFlagEmail(input({ runUrl: "javascript:alert(1)" }))).toThrow(TypeError);
  });
});
