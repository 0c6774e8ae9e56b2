import type { ReactNode } from "react";
import { Logo } from "@/components/ui/logo";
import { SiteFooter } from "@/components/ui/site-footer";

/** Signed-out pages: one narrow card on paper, the logo above it and the shared footer below. */
export default function AuthLayout({ children }: { children: ReactNode }) {
  return (
    <>
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-paper-raised focus:px-3 focus:py-2">
        Skip to the form
      </a>
      <header className="border-b border-rule bg-paper-raised">
        <div className="mx-auto flex max-w-6xl items-center px-gutter py-3">
          <Logo />
        </div>
      </header>
      <main id="main" className="mx-auto w-full max-w-md flex-1 px-gutter py-10 sm:py-16">
        {children}
      </main>
      <SiteFooter />
    </>
  );
}
