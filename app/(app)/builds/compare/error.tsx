"use client";

import { SegmentError } from "@/components/logbook/segment-error";

export default function CompareError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return <SegmentError error={error} reset={reset} what="the comparison" backHref="/layouts" backLabel="Back to the layouts" />;
}
