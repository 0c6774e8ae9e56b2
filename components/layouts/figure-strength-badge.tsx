import { MIN_BUILDS_FOR_TRUST, type FigureStrength } from "@/lib/layouts/layout-figures";
import { cn } from "@/lib/utils";

const look: Record<FigureStrength, { icon: string; word: string; className: string }> = {
  trusted: { icon: "✓", word: "Trusted", className: "border-verdict-pass/50 bg-verdict-passBg text-verdict-pass" },
  thin: { icon: "◔", word: "Thin", className: "border-verdict-warn/50 bg-verdict-warnBg text-verdict-warn" },
  none: { icon: "–", word: "No figure", className: "border-verdict-idle/40 bg-verdict-idleBg text-verdict-idle" },
};

export interface FigureStrengthBadgeProps {
  strength: FigureStrength;
  count: number;
  className?: string;
}

/** How far a lab figure can be trusted, in a word and an icon, with the count it rests on. */
export function FigureStrengthBadge({ strength, count, className }: FigureStrengthBadgeProps) {
  const l = look[strength];
  const detail =
    strength === "trusted"
      ? `${count} steady builds`
      : strength === "thin"
        ? `${count} of the ${MIN_BUILDS_FOR_TRUST} steady builds a trusted figure needs`
        : "no steady build yet";
  return (
    <span className={cn("inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-semibold", l.className, className)}>
      <span aria-hidden="true">{l.icon}</span>
      {l.word}
      <span className="font-normal">· {detail}</span>
    </span>
  );
}
