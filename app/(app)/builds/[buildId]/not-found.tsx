import { SegmentNotFound } from "@/components/logbook/segment-not-found";

export default function BuildNotFound() {
  return <SegmentNotFound what="build" />;
}
