import { BlockSkeleton, MetricsSkeleton, PageSkeleton } from "@/components/logbook/skeletons";

export default function Loading() {
  return (
    <PageSkeleton>
      <MetricsSkeleton />
      <div className="grid gap-5 lg:grid-cols-2">
        <BlockSkeleton />
        <BlockSkeleton />
      </div>
    </PageSkeleton>
  );
}
