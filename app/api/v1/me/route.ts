import { apiHandler } from "@/lib/http/api-handler";

export const dynamic = "force-dynamic";

/** Who the token or session acts for: id, e-mail, name and role (the permission table decides the rest). */
export const GET = apiHandler({ action: "read" }, async (_request, _context, user) =>
  Response.json({ id: user.id, email: user.email, name: user.name, role: user.role }),
);
