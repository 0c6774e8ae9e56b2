import { z } from "zod";
import { limitProblem, type LimitName, type PartKind } from "@/lib/oscillator";

// The bench limits of lib/oscillator/limits.ts as zod rules: the one place a form, a server action or a route
// handler refuses an absurd value, with the same words the predict command prints.

/** "part L must be …" → "Part L must be ….", the way field messages read. */
function sentence(problem: string): string {
  return problem.charAt(0).toUpperCase() + problem.slice(1) + ".";
}

/**
 * A refinement that adds the limit's message when the number is outside it.
 *
 * @param name - the limit in lib/oscillator/limits.ts.
 * @param subject - what the value is, as the message starts ("the target frequency").
 * @param path - where the issue goes when the rule runs on a whole object (["targetHz"]); none inside a field.
 */
export function withinLimit(name: LimitName, subject: string, path: (string | number)[] = []) {
  return (value: number, ctx: z.RefinementCtx): void => {
    const problem = limitProblem(name, value, subject);
    if (problem) ctx.addIssue({ code: "custom", path, message: sentence(problem) });
  };
}

/** A number of SI units within one limit. */
export function limitedNumber(name: LimitName, subject: string) {
  return z.number().superRefine(withinLimit(name, subject));
}

/** The limit a part value falls under: inductance, mutual inductance (Hartley's M) or capacitance; null for k. */
export function partLimitName(ref: string, kind: PartKind): LimitName | null {
  if (kind === "coupling") return null;
  if (ref === "M") return "mutualInductanceH";
  return kind === "inductance" ? "inductanceH" : "capacitanceF";
}
