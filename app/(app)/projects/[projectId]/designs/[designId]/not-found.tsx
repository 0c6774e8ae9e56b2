import { SegmentNotFound } from "@/components/logbook/segment-not-found";

export default function DesignNotFound() {
  return <SegmentNotFound what="design" />;
}
