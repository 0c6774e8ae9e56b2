"use client";

import { useMemo, useState, type ReactNode } from "react";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { cn } from "@/lib/utils";

export type SortValue = string | number | null;

export interface SortableColumn {
  key: string;
  label: string;
  numeric?: boolean;
  /** Whether the column can be sorted; default true. */
  sortable?: boolean;
  className?: string;
}

export interface SortableRow {
  key: string;
  cells: Record<string, ReactNode>;
  /** The value each sortable column sorts by (numbers in SI units, text, or null for "none"). */
  sort: Record<string, SortValue>;
  className?: string;
}

export interface SortableTableProps {
  caption: string;
  columns: SortableColumn[];
  rows: SortableRow[];
  /** Column and direction of the order the rows arrive in (e.g. newest first). */
  initialSort?: { key: string; direction: "asc" | "desc" };
}

function compare(a: SortValue, b: SortValue): number {
  // Rows without a value go last in either direction: "no reading" is not the smallest reading.
  if (a === null && b === null) return 0;
  if (a === null) return 1;
  if (b === null) return -1;
  if (typeof a === "number" && typeof b === "number") return a - b;
  return String(a).localeCompare(String(b), "en", { numeric: true, sensitivity: "base" });
}

/**
 * A table whose column headers sort the rows on this page (buttons, so the keyboard reaches them; the order is
 * announced with aria-sort). Paging and filtering stay on the server.
 */
export function SortableTable({ caption, columns, rows, initialSort }: SortableTableProps) {
  const [sort, setSort] = useState(initialSort ?? null);
  const sorted = useMemo(() => {
    if (!sort) return rows;
    const factor = sort.direction === "asc" ? 1 : -1;
    return [...rows].sort((x, y) => {
      const a = x.sort[sort.key] ?? null;
      const b = y.sort[sort.key] ?? null;
      if (a === null || b === null) return compare(a, b);
      return factor * compare(a, b);
    });
  }, [rows, sort]);

  return (
    <Table caption={caption}>
      <thead>
        <tr>
          {columns.map((c) => {
            const active = sort?.key === c.key;
            const ariaSort = active ? (sort.direction === "asc" ? "ascending" : "descending") : undefined;
            return (
              <Th key={c.key} aria-sort={ariaSort} className={cn(c.numeric && "text-right", c.className)}>
                {c.sortable === false ? (
                  c.label
                ) : (
                  <button
                    type="button"
                    className={cn("inline-flex items-center gap-1 rounded hover:text-ink", c.numeric && "flex-row-reverse")}
                    onClick={() =>
                      setSort((s) =>
                        s?.key === c.key ? { key: c.key, direction: s.direction === "asc" ? "desc" : "asc" } : { key: c.key, direction: c.numeric ? "desc" : "asc" },
                      )
                    }
                  >
                    <span>{c.label}</span>
                    <span aria-hidden="true" className={cn("text-[10px]", active ? "text-copper" : "text-ink-faint/60")}>
                      {active ? (sort.direction === "asc" ? "▲" : "▼") : "↕"}
                    </span>
                  </button>
                )}
              </Th>
            );
          })}
        </tr>
      </thead>
      <tbody>
        {sorted.map((row) => (
          <Tr key={row.key} className={row.className}>
            {columns.map((c) => (
              <Td key={c.key} numeric={c.numeric} className={cn(c.numeric && "whitespace-nowrap", c.className)}>
                {row.cells[c.key]}
              </Td>
            ))}
          </Tr>
        ))}
      </tbody>
    </Table>
  );
}
