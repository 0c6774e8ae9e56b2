import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-xl flex-1 px-gutter py-20">
      <p className="num font-mono text-sm text-ink-faint">404</p>
      <h1 className="mt-1 text-2xl font-semibold">Nothing here</h1>
      <p className="mt-3 text-ink-soft">
        The page you asked for does not exist, or you do not have access to it. Check the address, or go back to the
        start.
      </p>
      <Link href="/" className="mt-6 inline-block font-medium text-copper underline underline-offset-2">
        Back to Tankbook
      </Link>
    </main>
  );
}
