"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { cn } from "@/lib/utils";

export interface NavItem {
  href: string;
  label: string;
}

export interface NavLinksProps {
  items: NavItem[];
}

/** The primary navigation; the current section is marked for screen readers and by an underline. */
export function NavLinks({ items }: NavLinksProps) {
  const pathname = usePathname();
  return (
    <ul className="flex flex-wrap gap-1 whitespace-nowrap text-sm">
      {items.map((item) => {
        const current = pathname === item.href || pathname.startsWith(`${item.href}/`);
        return (
          <li key={item.href}>
            <Link
              href={item.href}
              aria-current={current ? "page" : undefined}
              className={cn(
                "inline-block rounded-md px-2.5 py-1.5 font-medium",
                current ? "bg-copper-light text-copper-dark underline decoration-2 underline-offset-4" : "text-ink-soft hover:bg-paper-sunk hover:text-ink",
              )}
            >
              {item.label}
            </Link>
          </li>
        );
      })}
    </ul>
  );
}
