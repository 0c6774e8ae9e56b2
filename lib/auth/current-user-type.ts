import type { Role } from "./permissions";

/** The signed-in person (or the owner of the API token) a request acts for. */
export type CurrentUser = { id: string; email: string; name: string; role: Role };
