import Link from "next/link";

/** The word mark: a small coil-and-capacitor glyph of our own beside the name. */
export function Logo({ href = "/" }: { href?: string }) {
  return (
    <Link href={href} className="inline-flex items-center gap-2 font-semibold tracking-tight text-ink">
      <svg aria-hidden="true" width="22" height="22" viewBox="0 0 22 22" className="text-copper">
        <path
          d="M2 11h3c0-3 3-3 3 0s3 3 3 0 3-3 3 0h1M15 5v12M18 5v12M18 11h2"
          fill="none"
          stroke="currentColor"
          strokeWidth="1.6"
          strokeLinecap="round"
        />
      </svg>
      <span>Tankbook</span>
    </Link>
  );
}
