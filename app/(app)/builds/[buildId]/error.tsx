"use client";

import { SegmentError } from "@/components/logbook/segment-error";

export default function BuildError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return <SegmentError error={error} reset={reset} what="this build" />;
}
