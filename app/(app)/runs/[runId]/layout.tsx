import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { isRowId } from "@/components/logbook/route-ids";
import { requireUser } from "@/lib/auth/current-user";
import { loadRun } from "./load-run";

/**
 * Answers a missing run with a real 404: the page streams behind its loading state, and a status
 * cannot change once streaming has begun, so the existence check runs here, before it.
 */
export default async function RunLayout({ children, params }: { children: ReactNode; params: Promise<{ runId: string }> }) {
  const { runId } = await params;
  await requireUser(`/runs/${runId}`);
  if (!isRowId(runId) || !(await loadRun(runId))) notFound();
  return children;
}
