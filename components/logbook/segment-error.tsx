"use client";

import Link from "next/link";
import { Button } from "@/components/ui/button";

export interface SegmentErrorProps {
  error: Error & { digest?: string };
  reset: () => void;
  /** What failed to load, e.g. "this run". */
  what: string;
  backHref?: string;
  backLabel?: string;
}

/** The body of a segment's error.tsx: what failed, that nothing was lost, and a retry. */
export function SegmentError({ error, reset, what, backHref = "/projects", backLabel = "Back to projects" }: SegmentErrorProps) {
  return (
    <div role="alert" className="mx-auto max-w-xl py-12">
      <h1 className="text-xl font-semibold">Could not load {what}</h1>
      <p className="mt-2 text-sm text-ink-soft">
        Something failed on the server while reading it. Nothing you saved was changed. Try again; if it keeps failing,
        tell your admin the reference below.
      </p>
      {error.digest ? <p className="num mt-2 font-mono text-xs text-ink-faint">Reference {error.digest}</p> : null}
      <div className="mt-5 flex flex-wrap gap-3">
        <Button onClick={reset}>Try again</Button>
        <Link href={backHref} className="inline-flex h-9 items-center text-sm font-medium text-copper underline underline-offset-2">
          {backLabel}
        </Link>
      </div>
    </div>
  );
}
