import { describe, expect, it } from "vitest";
import { actions, can, roleNeededFor, roles, type Action, type Role } from "@/lib/auth/permissions";

// The table of issue 5 ("Roles"), written out cell by cell so a change to lib/auth/permissions.ts has to
// change this too.
const table: Record<Action, Record<Role, boolean>> = {
  read: { viewer: true, technician: true, engineer: true, admin: true },
  "build:create": { viewer: false, technician: true, engineer: true, admin: true },
  "tweak:create": { viewer: false, technician: true, engineer: true, admin: true },
  "run:upload": { viewer: false, technician: true, engineer: true, admin: true },
  "run:reanalyse": { viewer: false, technician: true, engineer: true, admin: true },
  "run:withdraw": { viewer: false, technician: true, engineer: true, admin: true },
  "project:write": { viewer: false, technician: false, engineer: true, admin: true },
  "design:write": { viewer: false, technician: false, engineer: true, admin: true },
  "build:review": { viewer: false, technician: false, engineer: true, admin: true },
  "flag:acknowledge": { viewer: false, technician: false, engineer: true, admin: true },
  "people:manage": { viewer: false, technician: false, engineer: false, admin: true },
  "audit:read": { viewer: false, technician: false, engineer: false, admin: true },
};

describe("can", () => {
  it("covers every action of the permission table", () => {
    expect([...actions].sort()).toEqual(Object.keys(table).sort());
  });

  for (const action of actions) {
    for (const role of roles) {
      it(`${role} ${table[action][role] ? "may" : "may not"} ${action}`, () => {
        expect(can(role, action)).toBe(table[action][role]);
      });
    }
  }
});

describe("roleNeededFor", () => {
  it("names the lowest role that the table allows", () => {
    for (const action of actions) {
      const lowest = roles.find((r) => table[action][r]);
      expect(roleNeededFor(action)).toBe(lowest);
    }
  });
});
