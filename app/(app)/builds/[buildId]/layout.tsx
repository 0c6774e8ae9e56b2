import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { isRowId } from "@/components/logbook/route-ids";
import { requireUser } from "@/lib/auth/current-user";
import { loadBuild } from "./load-build";

/**
 * Answers a missing build with a real 404: the page streams behind its loading state, and a status
 * cannot change once streaming has begun, so the existence check runs here, before it.
 */
export default async function BuildLayout({ children, params }: { children: ReactNode; params: Promise<{ buildId: string }> }) {
  const { buildId } = await params;
  await requireUser(`/builds/${buildId}`);
  if (!isRowId(buildId) || !(await loadBuild(buildId))) notFound();
  return children;
}
