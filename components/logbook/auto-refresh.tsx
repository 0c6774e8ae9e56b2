"use client";

import { useRouter } from "next/navigation";
import { useEffect } from "react";

/**
 * Re-renders the server page every few seconds while `active` (e.g. while a run on it is still analysing), so the
 * page updates by itself and stops asking once everything is finished.
 */
export function AutoRefresh({ active, intervalMs = 3000 }: { active: boolean; intervalMs?: number }) {
  const router = useRouter();
  useEffect(() => {
    if (!active) return;
    const timer = setInterval(() => {
      if (document.visibilityState === "visible") router.refresh();
    }, intervalMs);
    return () => clearInterval(timer);
  }, [active, intervalMs, router]);
  return active ? (
    <p role="status" className="flex items-center gap-2 text-xs text-ink-soft">
      <span aria-hidden="true" className="inline-block h-2 w-2 animate-pulse rounded-full bg-copper" />
      A capture is being analysed; this page updates by itself.
    </p>
  ) : null;
}
