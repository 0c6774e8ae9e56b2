import Link from "next/link";

export interface Crumb {
  label: string;
  href?: string;
}

/** Where a page sits: project › design › build. The last crumb is the page itself and is not a link. */
export function Breadcrumbs({ items }: { items: Crumb[] }) {
  return (
    <nav aria-label="Breadcrumb" className="min-w-0">
      <ol className="flex flex-wrap items-center gap-x-1.5 text-xs text-ink-faint">
        {items.map((c, i) => (
          <li key={`${c.label}-${i}`} className="flex min-w-0 items-center gap-1.5">
            {i > 0 ? <span aria-hidden="true">›</span> : null}
            {c.href ? (
              <Link href={c.href} className="truncate font-medium text-ink-soft hover:text-copper hover:underline">
                {c.label}
              </Link>
            ) : (
              <span className="truncate" aria-current="page">
                {c.label}
              </span>
            )}
          </li>
        ))}
      </ol>
    </nav>
  );
}
