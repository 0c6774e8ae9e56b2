import { SegmentNotFound } from "@/components/logbook/segment-not-found";

export default function ProjectNotFound() {
  return <SegmentNotFound what="project" />;
}
