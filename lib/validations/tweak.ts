import { z } from "zod";
import { TOPOLOGY_PARTS, parseValue, type Topology } from "@/lib/oscillator";
import { booleanField, optionalText } from "./common";
import { partLimitName, withinLimit } from "./limits";

const UNIT_OF_KIND = { inductance: "H", capacitance: "F", coupling: undefined } as const;

/**
 * A tweak on a build of `topology`: a part's new value (engineering notation, an IEC 60062 code or an SI number),
 * or a free note, or both. `planned` logs it without changing the as-built values (e.g. a retune to try next).
 */
export function tweakInputSchemaFor(topology: Topology) {
  const roles = TOPOLOGY_PARTS[topology];
  return z
    .object({
      partRef: optionalText(8, "The part"),
      toValue: z.union([z.string(), z.number()]).optional(),
      note: optionalText(2000, "The note").transform((v) => v ?? ""),
      planned: booleanField.default(false),
    })
    .transform((t, ctx) => {
      const blankValue = t.toValue === undefined || (typeof t.toValue === "string" && t.toValue.trim() === "");
      if (!t.partRef && blankValue && !t.note) {
        ctx.addIssue({ code: "custom", path: ["note"], message: "Say what changed: pick a part and its new value, or write a note." });
        return z.NEVER;
      }
      if (!t.partRef) {
        if (!blankValue) ctx.addIssue({ code: "custom", path: ["partRef"], message: "Pick the part this value is for." });
        return { partRef: null, toValue: null, note: t.note, planned: t.planned };
      }
      const role = roles[t.partRef];
      if (!role) {
        ctx.addIssue({ code: "custom", path: ["partRef"], message: `${topology} has no part ${t.partRef} (its parts are ${Object.keys(roles).join(", ")}).` });
        return z.NEVER;
      }
      if (blankValue) {
        ctx.addIssue({ code: "custom", path: ["toValue"], message: `Enter the new value of ${t.partRef}.` });
        return z.NEVER;
      }
      let toValue: number;
      try {
        toValue = typeof t.toValue === "number" ? t.toValue : parseValue(t.toValue as string, UNIT_OF_KIND[role.kind]);
      } catch (err) {
        ctx.addIssue({ code: "custom", path: ["toValue"], message: err instanceof Error ? err.message : "This is not a value." });
        return z.NEVER;
      }
      const limit = partLimitName(t.partRef, role.kind);
      if (limit === null) {
        if (!(Number.isFinite(toValue) && toValue >= 0 && toValue <= 1)) {
          ctx.addIssue({ code: "custom", path: ["toValue"], message: `The new value of ${t.partRef} (coupling coefficient) must be a number from 0 to 1; got ${toValue}.` });
          return z.NEVER;
        }
      } else {
        const before = ctx.issues.length;
        withinLimit(limit, `the new value of ${t.partRef}`, ["toValue"])(toValue, ctx);
        if (ctx.issues.length > before) return z.NEVER;
      }
      return { partRef: t.partRef, toValue, note: t.note, planned: t.planned };
    });
}
export type TweakInput = z.output<ReturnType<typeof tweakInputSchemaFor>>;
