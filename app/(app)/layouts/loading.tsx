import { BlockSkeleton, PageSkeleton } from "@/components/logbook/skeletons";

export default function Loading() {
  return (
    <PageSkeleton>
      <BlockSkeleton height={180} />
      <BlockSkeleton height={180} />
    </PageSkeleton>
  );
}
