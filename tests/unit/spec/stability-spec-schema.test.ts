import { describe, expect, it } from "vitest";
import { designSpecSchema } from "@/lib/validations/design";
import { draftFromRevision } from "@/components/logbook/design-draft";
import { specPhrases } from "@/components/logbook/design-model";

// The design form's stability limits through the same zod schema the server action and the API use.
describe("designSpecSchema stability limits", () => {
  it("reads times with a prefix and unit, the offset as a frequency, and leaves blanks unset", () => {
    const spec = designSpecSchema.parse({ maxRmsJitterS: "50 ps", maxStartUpS: "2ms", phaseNoiseOffsetHz: "10k", maxPhaseNoiseDbcPerHz: "-100", maxPushingPpmPerV: "20", maxTempcoPpmPerK: "" });
    expect(spec.maxRmsJitterS).toBeCloseTo(50e-12, 24);
    expect(spec.maxStartUpS).toBeCloseTo(2e-3, 12);
    expect(spec).toMatchObject({ phaseNoiseOffsetHz: 10_000, maxPhaseNoiseDbcPerHz: -100, maxPushingPpmPerV: 20, maxTempcoPpmPerK: null });
    // The API may send seconds as numbers.
    expect(designSpecSchema.parse({ maxRmsJitterS: 1e-9 }).maxRmsJitterS).toBe(1e-9);
  });

  it("refuses a phase-noise limit without its offset (and the reverse), a positive dBc/Hz and a time that is not one", () => {
    const issues = (input: Record<string, unknown>) => {
      const r = designSpecSchema.safeParse(input);
      return r.success ? [] : r.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`);
    };
    expect(issues({ maxPhaseNoiseDbcPerHz: "-100" })).toEqual([expect.stringMatching(/^phaseNoiseOffsetHz: A phase-noise limit needs the offset/)]);
    expect(issues({ phaseNoiseOffsetHz: "10k" })).toEqual([expect.stringMatching(/^maxPhaseNoiseDbcPerHz: An offset needs/)]);
    expect(issues({ phaseNoiseOffsetHz: "10k", maxPhaseNoiseDbcPerHz: "12" })).toEqual([expect.stringMatching(/^maxPhaseNoiseDbcPerHz: .*at most 0/)]);
    expect(issues({ maxRmsJitterS: "soon" })).toEqual([expect.stringMatching(/^maxRmsJitterS: The rms jitter limit is a time/)]);
    expect(issues({ maxStartUpS: "-2 ms" })).toEqual([expect.stringMatching(/above 0 s/)]);
    expect(issues({ maxPushingPpmPerV: "-5" })).toEqual([expect.stringMatching(/^maxPushingPpmPerV: .*at least 0/)]);
  });

  it("round-trips through the form's draft text and reads in the spec phrases", () => {
    const spec = designSpecSchema.parse({ maxRmsJitterS: "50 ps", maxStartUpS: "2 ms", phaseNoiseOffsetHz: "10k", maxPhaseNoiseDbcPerHz: "-100", maxTempcoPpmPerK: "50" });
    const draft = draftFromRevision("d", "tank", { parts: { L: { valueSi: 1e-6 }, C: { valueSi: 1e-9 } }, extraCapacitanceF: null, windings: null, spec });
    expect(draft.spec).toMatchObject({ maxRmsJitterS: "50 ps", maxStartUpS: "2 ms", phaseNoiseOffsetHz: "10 kHz", maxPhaseNoiseDbcPerHz: "-100", maxTempcoPpmPerK: "50" });
    expect(designSpecSchema.parse(draft.spec)).toEqual(spec);
    expect(specPhrases(spec)).toEqual(expect.arrayContaining(["rms jitter ≤ 50 ps", "phase noise ≤ −100.0 dBc/Hz at 10 kHz", "start-up ≤ 2 ms", "|tempco| ≤ 50 ppm/K"]));
  });
});
