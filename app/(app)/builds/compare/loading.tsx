import { PageSkeleton, TableSkeleton } from "@/components/logbook/skeletons";

export default function Loading() {
  return (
    <PageSkeleton>
      <TableSkeleton rows={10} />
    </PageSkeleton>
  );
}
