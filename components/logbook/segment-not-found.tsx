import Link from "next/link";

/** The body of a segment's not-found.tsx. */
export function SegmentNotFound({ what, backHref = "/projects", backLabel = "Back to projects" }: { what: string; backHref?: string; backLabel?: string }) {
  return (
    <div className="mx-auto max-w-xl py-12">
      <p className="num font-mono text-sm text-ink-faint">404</p>
      <h1 className="mt-1 text-xl font-semibold">No such {what}</h1>
      <p className="mt-2 text-sm text-ink-soft">
        It may have been deleted, or the link is mistyped. Check the address, or start again from the list.
      </p>
      <Link href={backHref} className="mt-5 inline-block text-sm font-medium text-copper underline underline-offset-2">
        {backLabel}
      </Link>
    </div>
  );
}
