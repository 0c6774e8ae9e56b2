import { EmptyState } from "@/components/ui/empty-state";

export interface ForbiddenNoticeProps {
  message: string;
}

/** What a page shows a signed-in person whose role does not allow it: the reason, never a blank page. */
export function ForbiddenNotice({ message }: ForbiddenNoticeProps) {
  return (
    <div role="alert">
      <EmptyState title="This page is not open to your role">
        {message} Ask an admin if you need it.
      </EmptyState>
    </div>
  );
}
