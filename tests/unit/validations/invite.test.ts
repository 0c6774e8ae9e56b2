import { describe, expect, it } from "vitest";
import { inviteSchema } from "@/lib/validations/people";

describe("inviteSchema", () => {
  it("asks for the invitee's address, not the sender's, when the field is empty", () => {
    for (const email of ["", "   ", undefined]) {
      const parsed = inviteSchema.safeParse({ email, role: "technician" });
      expect(parsed.success).toBe(false);
      const message = parsed.error!.issues[0].message;
      expect(message).toBe("Enter the e-mail address of the person you are inviting.");
      expect(message).not.toContain("your e-mail");
    }
  });

  it("keeps the address rules: trimmed and lower-cased, a malformed one refused", () => {
    expect(inviteSchema.parse({ email: "  Ana@Lab.Example ", role: "viewer" }).email).toBe("ana@lab.example");
    expect(inviteSchema.safeParse({ email: "ana-at-lab", role: "viewer" }).error?.issues[0].message).toBe("Enter an e-mail address like name@lab.example.");
  });
});
