import { cn } from "@/lib/utils";

export interface SafetyNoteProps {
  className?: string;
  compact?: boolean;
}

/** The cautions every page footer and the spec-preset picker carry. The wording is shared with the README. */
export function SafetyNote({ className, compact = false }: SafetyNoteProps) {
  return (
    <aside aria-label="Safety note" className={cn("text-xs leading-relaxed text-ink-soft", className)}>
      <p>
        <strong className="font-semibold text-ink">Safety.</strong> An oscillator connected to an antenna can radiate:
        transmitting may need a licence and must meet the spurious-emission limits of your local regulator. Follow your
        lab&apos;s electrical-safety rules for mains-powered supplies.
        {compact ? " " : <br />}
        Tankbook&apos;s limit presets are examples only — your local codes and licensed practice govern.
      </p>
    </aside>
  );
}
