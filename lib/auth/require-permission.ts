import { ForbiddenError, UnauthorizedError } from "@/lib/errors";
import { can, roleNeededFor, type Action, type Role } from "./permissions";
import type { CurrentUser } from "./current-user-type";

// What each action is called in a refusal: "<phrase> needs the <role> role or above".
const actionPhrase: Record<Action, string> = {
  read: "Reading projects, designs, builds and runs",
  "build:create": "Creating builds",
  "tweak:create": "Logging tweaks",
  "run:upload": "Uploading captures",
  "run:reanalyse": "Re-analysing captures",
  "run:withdraw": "Withdrawing or restoring runs",
  "project:write": "Creating and editing projects",
  "design:write": "Creating and editing designs and specs",
  "build:review": "Accepting or rejecting builds",
  "flag:acknowledge": "Acknowledging flags",
  "people:manage": "Inviting people, changing roles and disabling accounts",
  "audit:read": "Reading the audit log",
};

const article: Record<Role, string> = { viewer: "a viewer", technician: "a technician", engineer: "an engineer", admin: "an admin" };

/** The sentence a refused request shows, e.g. "Uploading captures needs the technician role or above; you are signed in as a viewer." */
export function refusalMessage(role: Role, action: Action): string {
  const needed = roleNeededFor(action);
  const scope = needed === "admin" ? "the admin role" : `the ${needed} role or above`;
  return `${actionPhrase[action]} needs ${scope}; you are signed in as ${article[role]}.`;
}

/**
 * The one check every server action and route handler makes before acting.
 * @returns the same user, narrowed to non-null
 * @throws UnauthorizedError when nobody is signed in; ForbiddenError with a sentence naming the role needed otherwise
 */
export function requirePermission(user: CurrentUser | null, action: Action): CurrentUser {
  if (!user) throw new UnauthorizedError();
  if (!can(user.role, action)) throw new ForbiddenError(refusalMessage(user.role, action));
  return user;
}
