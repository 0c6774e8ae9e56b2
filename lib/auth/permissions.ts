// The one permission table. Every server action and route handler asks `can` (through `requirePermission`
// in lib/auth); nothing else decides who may do what.

export const roles = ["viewer", "technician", "engineer", "admin"] as const;
export type Role = (typeof roles)[number];

export const actions = [
  "read", // projects, designs, builds, runs
  "build:create",
  "tweak:create",
  "run:upload",
  "run:reanalyse",
  "run:withdraw", // withdraw a run from the figures, or restore it
  "project:write",
  "design:write",
  "build:review", // accept or reject a build
  "flag:acknowledge",
  "people:manage", // invite, change roles, disable accounts
  "audit:read",
] as const;
export type Action = (typeof actions)[number];

const minimumRole: Record<Action, Role> = {
  read: "viewer",
  "build:create": "technician",
  "tweak:create": "technician",
  "run:upload": "technician",
  "run:reanalyse": "technician",
  // Whoever may edit the build (its timebase, tweaks, captures) may take one of its runs out of the figures.
  "run:withdraw": "technician",
  "project:write": "engineer",
  "design:write": "engineer",
  "build:review": "engineer",
  "flag:acknowledge": "engineer",
  "people:manage": "admin",
  "audit:read": "admin",
};

const rank: Record<Role, number> = { viewer: 0, technician: 1, engineer: 2, admin: 3 };

/** Whether a user of `role` may perform `action`. Roles are ordered: each can do what the ones below can. */
export function can(role: Role, action: Action): boolean {
  return rank[role] >= rank[minimumRole[action]];
}

/** The lowest role allowed to perform `action`, for messages such as "needs the engineer role". */
export function roleNeededFor(action: Action): Role {
  return minimumRole[action];
}
