import { SegmentNotFound } from "@/components/logbook/segment-not-found";

export default function RunNotFound() {
  return <SegmentNotFound what="run" />;
}
