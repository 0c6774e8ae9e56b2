"use client";

export default function ErrorPage({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <main className="mx-auto max-w-xl flex-1 px-gutter py-20" role="alert">
      <h1 className="text-2xl font-semibold">Something went wrong on our side</h1>
      <p className="mt-3 text-ink-soft">
        Your data is safe: nothing you had saved was changed. Try again; if it keeps failing, tell your admin the
        reference below.
      </p>
      {error.digest ? <p className="num mt-3 font-mono text-xs text-ink-faint">Reference {error.digest}</p> : null}
      <button
        type="button"
        onClick={reset}
        className="mt-6 rounded-md border border-copper bg-copper px-3 py-1.5 text-sm font-medium text-white hover:bg-copper-dark"
      >
        Try again
      </button>
    </main>
  );
}
