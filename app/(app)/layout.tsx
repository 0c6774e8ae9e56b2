import type { ReactNode } from "react";
import { redirect } from "next/navigation";
import { Logo } from "@/components/ui/logo";
import { SiteFooter } from "@/components/ui/site-footer";
import { getCurrentUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { outboxAvailable } from "@/lib/auth/outbox-available";
import { signOutAction } from "../(auth)/actions";
import { NavLinks, type NavItem } from "./nav-links";

/** The signed-in app shell. Pages still check permissions themselves: a layout check does not guard actions. */
export default async function AppLayout({ children }: { children: ReactNode }) {
  const user = await getCurrentUser();
  if (!user) redirect("/sign-in");
  const items: NavItem[] = [
    { href: "/dashboard", label: "Home" },
    { href: "/projects", label: "Projects" },
    { href: "/layouts", label: "Layouts" },
    ...(can(user.role, "people:manage") ? [{ href: "/people", label: "People" }] : []),
    ...(can(user.role, "audit:read") ? [{ href: "/audit", label: "Audit" }] : []),
    { href: "/profile", label: "Profile" },
    { href: "/api-docs", label: "API" },
    ...(can(user.role, "people:manage") && outboxAvailable() ? [{ href: "/outbox", label: "Outbox" }] : []),
  ];
  return (
    <>
      <a
        href="#main"
        className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-paper-raised focus:px-3 focus:py-2"
      >
        Skip to the content
      </a>
      <header className="no-print border-b border-rule bg-paper-raised">
        <div className="mx-auto flex max-w-6xl flex-wrap items-center gap-x-4 gap-y-2 px-gutter py-2.5">
          <Logo href="/dashboard" />
          <nav aria-label="Primary" className="order-3 -mx-1 w-full min-w-0 sm:order-none sm:mx-0 sm:w-auto sm:flex-1">
            <NavLinks items={items} />
          </nav>
          <div className="ml-auto flex items-center gap-3 text-sm">
            <span className="hidden min-w-0 text-right leading-tight sm:block">
              <span className="block max-w-[14rem] truncate font-medium text-ink">{user.name}</span>
              <span className="block text-xs text-ink-faint">{user.role}</span>
            </span>
            <span className="text-xs text-ink-soft sm:hidden">
              {user.name.split(" ")[0]} · {user.role}
            </span>
            <form action={signOutAction}>
              <button
                type="submit"
                className="rounded-md border border-rule-strong bg-paper-raised px-2.5 py-1 text-sm font-medium text-ink hover:bg-paper-sunk"
              >
                Sign out
              </button>
            </form>
          </div>
        </div>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-6xl flex-1 px-gutter py-6 focus:outline-none">
        {children}
      </main>
      <SiteFooter />
    </>
  );
}
