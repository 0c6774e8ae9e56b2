import { describe, expect, it } from "vitest";
import { ForbiddenError, UnauthorizedError } from "@/lib/errors";
import { actions, can, roles } from "@/lib/auth/permissions";
import { refusalMessage, requirePermission } from "@/lib/auth/require-permission";

const user = (role: (typeof roles)[number]) => ({ id: "u1", email: "x@y.test", name: "X", role });

describe("requirePermission", () => {
  it("throws UnauthorizedError (401) when nobody is signed in", () => {
    expect(() => requirePermission(null, "read")).toThrow(UnauthorizedError);
  });

  for (const role of roles) {
    for (const action of actions) {
      it(`${role} × ${action}: ${can(role, action) ? "returns the user" : "throws ForbiddenError (403)"}`, () => {
        if (can(role, action)) expect(requirePermission(user(role), action)).toEqual(user(role));
        else {
          let thrown: unknown;
          try {
            requirePermission(user(role), action);
          } catch (err) {
            thrown = err;
          }
          expect(thrown).toBeInstanceOf(ForbiddenError);
          expect((thrown as ForbiddenError).status).toBe(403);
          expect((thrown as ForbiddenError).message).toBe(refusalMessage(role, action));
        }
      });
    }
  }
});

describe("refusalMessage", () => {
  it("says what the action needs and what the user is", () => {
    expect(refusalMessage("viewer", "run:upload")).toBe("Uploading captures needs the technician role or above; you are signed in as a viewer.");
    expect(refusalMessage("engineer", "people:manage")).toBe(
      "Inviting people, changing roles and disabling accounts needs the admin role; you are signed in as an engineer.",
    );
  });
});
