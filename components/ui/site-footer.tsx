import { SafetyNote } from "./safety-note";

export function SiteFooter() {
  return (
    <footer className="mt-16 border-t border-rule bg-paper-sunk/60">
      <div className="mx-auto max-w-6xl px-gutter py-6">
        <SafetyNote />
        <p className="mt-3 text-xs text-ink-faint">Tankbook — the bench logbook for LC oscillator builds.</p>
      </div>
    </footer>
  );
}
