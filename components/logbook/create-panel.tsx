"use client";

import { useState, type ReactNode } from "react";
import { Card, CardBody } from "@/components/ui/card";
import { cn } from "@/lib/utils";

/** A collapsible "New …" panel above a list, open by default when the list is empty. */
export function CreatePanel({ title, startOpen = false, children }: { title: string; startOpen?: boolean; children: ReactNode }) {
  const [open, setOpen] = useState(startOpen);
  return (
    <Card className="mb-5">
      <button
        type="button"
        aria-expanded={open}
        onClick={() => setOpen((o) => !o)}
        className="flex w-full items-center justify-between gap-2 rounded-lg px-4 py-3 text-left text-sm font-semibold text-ink hover:bg-paper-sunk/50"
      >
        <span>
          <span aria-hidden="true" className="mr-1.5 text-copper">+</span>
          {title}
        </span>
        <span aria-hidden="true" className={cn("text-ink-faint transition-transform", open && "rotate-180")}>
          ▾
        </span>
      </button>
      {open ? <CardBody className="border-t border-rule">{children}</CardBody> : null}
    </Card>
  );
}
