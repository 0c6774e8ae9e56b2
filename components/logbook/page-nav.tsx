import Link from "next/link";
import { buttonVariants } from "@/components/ui/button";

export interface PageNavProps {
  /** The page's path, e.g. "/projects". */
  basePath: string;
  /** Current search params (filters) to keep on every link; the cursor is replaced. */
  params: Record<string, string | undefined>;
  nextCursor: string | null;
  /** Whether this is a later page (a cursor was given), so "First page" makes sense. */
  hasCursor: boolean;
  shown: number;
  noun: string;
}

function href(basePath: string, params: Record<string, string | undefined>, cursor: string | null): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(params)) if (v && k !== "cursor") q.set(k, v);
  if (cursor) q.set("cursor", cursor);
  const s = q.toString();
  return s ? `${basePath}?${s}` : basePath;
}

/** Server-side paging for newest-first lists: "First page" and "Older" links that keep the filters. */
export function PageNav({ basePath, params, nextCursor, hasCursor, shown, noun }: PageNavProps) {
  if (!nextCursor && !hasCursor) return null;
  return (
    <nav aria-label={`${noun} pages`} className="mt-3 flex flex-wrap items-center justify-between gap-2 text-sm text-ink-soft">
      <span>
        Showing {shown} {noun}
        {hasCursor ? " (older page)" : ""}
      </span>
      <span className="flex gap-2">
        {hasCursor ? (
          <Link href={href(basePath, params, null)} className={buttonVariants({ variant: "secondary", size: "sm" })}>
            ← Newest
          </Link>
        ) : null}
        {nextCursor ? (
          <Link href={href(basePath, params, nextCursor)} className={buttonVariants({ variant: "secondary", size: "sm" })}>
            Older →
          </Link>
        ) : null}
      </span>
    </nav>
  );
}
