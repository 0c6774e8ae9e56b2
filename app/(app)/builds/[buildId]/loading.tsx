import { BlockSkeleton, PageSkeleton, TableSkeleton } from "@/components/logbook/skeletons";

export default function Loading() {
  return (
    <PageSkeleton>
      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_24rem]">
        <TableSkeleton rows={8} />
        <BlockSkeleton height={220} />
      </div>
    </PageSkeleton>
  );
}
