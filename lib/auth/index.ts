import "server-only";

// The auth surface the rest of the app codes against. Scripts and tests (outside Next) import the
// underlying files directly, because "server-only" refuses to load there.

export type { CurrentUser } from "./current-user-type";
export type { Role, Action } from "./permissions";
export { can, roleNeededFor, roles, actions } from "./permissions";
export { getCurrentUser, getCurrentSession, requireUser, setSessionCookie, clearSessionCookie } from "./current-user";
export { authenticateRequest, originAllowed } from "./authenticate-request";
export { requirePermission, refusalMessage } from "./require-permission";
export { clientIp } from "./client-ip";
export { recordAudit } from "@/db/queries/audit";
