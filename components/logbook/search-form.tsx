import { Input } from "@/components/ui/field";
import { buttonVariants } from "@/components/ui/button";
import type { ReactNode } from "react";

export interface SearchFormProps {
  /** Where the form GETs (the list page itself). */
  action: string;
  q?: string;
  label: string;
  placeholder?: string;
  /** Extra filter controls (selects named like the query parameter). */
  children?: ReactNode;
}

/** A GET form for a list's filters: works without JavaScript and keeps the filters in the URL. */
export function SearchForm({ action, q, label, placeholder, children }: SearchFormProps) {
  return (
    <form action={action} method="get" role="search" aria-label={label} className="mb-3 flex flex-wrap items-end gap-2">
      <div className="min-w-0 flex-1 basis-48">
        <label htmlFor={`${action}-q`} className="sr-only">
          {label}
        </label>
        <Input id={`${action}-q`} name="q" type="search" defaultValue={q ?? ""} placeholder={placeholder ?? "Search"} />
      </div>
      {children}
      <button type="submit" className={buttonVariants({ variant: "secondary" })}>
        Filter
      </button>
    </form>
  );
}
