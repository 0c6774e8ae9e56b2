import { BlockSkeleton, PageSkeleton, TableSkeleton } from "@/components/logbook/skeletons";

export default function Loading() {
  return (
    <PageSkeleton>
      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <TableSkeleton rows={4} />
        <BlockSkeleton height={180} />
      </div>
      <TableSkeleton rows={3} />
    </PageSkeleton>
  );
}
