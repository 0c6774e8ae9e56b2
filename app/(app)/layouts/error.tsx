"use client";

import { SegmentError } from "@/components/logbook/segment-error";

export default function LayoutsError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return <SegmentError error={error} reset={reset} what="the layout figures" backHref="/dashboard" backLabel="Back to the home page" />;
}
