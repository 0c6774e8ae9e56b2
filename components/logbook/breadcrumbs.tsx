import Link from "next/link";

export interface Crumb {
  label: string;
  href?: string;
}

/** How far down the logbook a page sits; a design or build step is shown only when both its id and name are given. */
export interface TrailPlace {
  projectId: string;
  projectName: string;
  designId?: string;
  designName?: string;
  buildId?: string;
  buildLabel?: string;
}

/**
 * The crumbs for a page under a project: Projects › project › design › build, each linked, then the page's own
 * unlinked crumb.
 * @param place the project and, if any, the design and build above the page
 * @param here the page's own label
 * @returns the crumbs to hand to Breadcrumbs
 */
export function trailCrumbs(place: TrailPlace, here: string): Crumb[] {
  const crumbs: Crumb[] = [
    { label: "Projects", href: "/projects" },
    { label: place.projectName, href: `/projects/${place.projectId}` },
  ];
  if (place.designId && place.designName) {
    crumbs.push({ label: place.designName, href: `/projects/${place.projectId}/designs/${place.designId}` });
  }
  if (place.buildId && place.buildLabel) crumbs.push({ label: place.buildLabel, href: `/builds/${place.buildId}` });
  crumbs.push({ label: here });
  return crumbs;
}

/** The place of a page that sits under a build: the build with its design and project names. */
export function buildPlace(build: {
  id: string;
  label: string;
  projectId: string;
  projectName: string;
  designId: string;
  designName: string;
}): TrailPlace {
  return {
    projectId: build.projectId,
    projectName: build.projectName,
    designId: build.designId,
    designName: build.designName,
    buildId: build.id,
    buildLabel: build.label,
  };
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
