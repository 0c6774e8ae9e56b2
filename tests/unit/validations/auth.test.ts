import { describe, expect, it } from "vitest";
import { emailSchema, nextPathSchema, resetPasswordSchema, signInSchema } from "@/lib/validations/auth";

describe("emailSchema", () => {
  it("trims and lower-cases an address", () => {
    expect(emailSchema.parse("  Ada.Admin@Demo.TEST ")).toBe("ada.admin@demo.test");
  });
  it("refuses something that is not an address", () => {
    expect(emailSchema.safeParse("ada").success).toBe(false);
  });
});

describe("nextPathSchema", () => {
  it("keeps a same-site path", () => {
    expect(nextPathSchema.parse("/projects/42?tab=runs")).toBe("/projects/42?tab=runs");
  });
  it("falls back to the dashboard for other sites, protocol-relative and backslash tricks, and the sign-in page", () => {
    for (const bad of ["https://evil.example", "//evil.example", "/\\evil.example", "javascript:alert(1)", "/sign-in", undefined]) {
      expect(nextPathSchema.parse(bad)).toBe("/dashboard");
    }
  });
});

describe("signInSchema", () => {
  it("reports both empty fields", () => {
    const r = signInSchema.safeParse({ email: "", password: "" });
    expect(r.success).toBe(false);
    expect(r.error!.issues.map((i) => i.path[0]).sort()).toEqual(["email", "password"]);
  });
});

describe("resetPasswordSchema", () => {
  it("asks for 10 characters and two equal entries", () => {
    const r = resetPasswordSchema.safeParse({ token: "x".repeat(43), password: "short", confirm: "other" });
    expect(r.success).toBe(false);
    // zod 4 still runs the refinement after a length failure, so the form can show both at once.
    expect(r.error!.issues.map((i) => i.message)).toEqual(["Use at least 10 characters.", "The two passwords differ."]);
    const differ = resetPasswordSchema.safeParse({ token: "x".repeat(43), password: "long enough one", confirm: "long enough two" });
    expect(differ.error!.issues.map((i) => i.message)).toEqual(["The two passwords differ."]);
  });
});
