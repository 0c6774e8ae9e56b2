import { z } from "zod";

/** Largest timebase error Tankbook accepts, ppm: 1 % (a scope this far off is broken, not uncalibrated). */
export const MAX_TIMEBASE_PPM = 10_000;

const ppmNumber = z
  .number({ error: "The timebase accuracy must be a number of ppm." })
  .refine(Number.isFinite, "The timebase accuracy must be a finite number of ppm.")
  .refine((v) => v >= 0, "The timebase accuracy is a ± figure: give it as 0 ppm or more.")
  .refine((v) => v <= MAX_TIMEBASE_PPM, `The timebase accuracy must be at most ${MAX_TIMEBASE_PPM} ppm (1 %).`);

/** The scope timebase accuracy of a build, ± ppm; null clears it. From the API (a JSON number) or a form (text, empty for none). */
export const timebaseInputSchema = z.object({
  timebasePpm: z.preprocess((v) => {
    if (typeof v !== "string") return v;
    const text = v.trim().replace(/^±\s*/, "").replace(/\s*ppm$/i, "").replace(",", ".");
    if (text === "") return null;
    return /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i.test(text) ? Number(text) : v;
  }, ppmNumber.nullable()),
});

export type TimebaseInput = z.infer<typeof timebaseInputSchema>;
