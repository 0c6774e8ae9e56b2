import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { cn } from "@/lib/utils";

/** A dense table that scrolls sideways on a phone instead of squeezing its numbers. */
export function Table({ className, children, caption }: { className?: string; children: ReactNode; caption?: string }) {
  return (
    // relative: a visually hidden label in a far cell (absolutely positioned) is then clipped by this scroller
    // instead of widening the whole page on a phone.
    <div className={cn("relative overflow-x-auto rounded-lg border border-rule bg-paper-raised", className)}>
      <table className="w-full border-collapse text-sm">
        {caption ? <caption className="sr-only">{caption}</caption> : null}
        {children}
      </table>
    </div>
  );
}

export function Th({ className, ...props }: ThHTMLAttributes<HTMLTableCellElement>) {
  return (
    <th
      scope="col"
      className={cn("border-b border-rule bg-paper-sunk/70 px-3 py-2 text-left text-xs font-semibold text-ink-soft", className)}
      {...props}
    />
  );
}

export function Td({ className, numeric, ...props }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <td
      className={cn("border-b border-rule/70 px-3 py-2 align-top leading-6", numeric && "num text-right font-mono text-[13px]", className)}
      {...props}
    />
  );
}

export function Tr({ className, ...props }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={cn("hover:bg-paper-sunk/40", className)} {...props} />;
}
