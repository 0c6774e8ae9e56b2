import type { DesignSpec } from "./types";

/**
 * Spec presets: starting points an engineer picks on the design form and then adapts. Every preset is an
 * example, never a compliance test: each one stores where its number comes from (a law's section, or the
 * trade's practice) and what kind of limit it is, so the picker can say so beside it.
 * Values and their basis: ../shared/REFERENCES.md §6.
 */

/** Where a preset's number comes from: a law (cited), or the trade's own practice. */
export type PresetBasis = "law" | "practice";

/**
 * What the preset limits: the level of every single harmonic in dBc (spec.maxHarmonicDbc), the total harmonic
 * distortion in % (spec.maxThdPercent), or the frequency window around the target (spec.toleranceValue).
 */
export type PresetLimitKind =
  | "per-harmonic-dbc"
  | "thd-percent"
  | "frequency-tolerance"
  | "rms-jitter-s"
  | "phase-noise-dbc-hz"
  | "start-up-s"
  | "pushing-ppm-per-v"
  | "tempco-ppm-per-k";

/** The spec fields a preset may set; the target frequency always stays the engineer's. */
export type PresetSpec = Pick<
  DesignSpec,
  | "maxHarmonicDbc"
  | "maxThdPercent"
  | "toleranceValue"
  | "toleranceUnit"
  | "maxRmsJitterS"
  | "phaseNoiseOffsetHz"
  | "maxPhaseNoiseDbcPerHz"
  | "maxStartUpS"
  | "maxPushingPpmPerV"
  | "maxTempcoPpmPerK"
>;

export interface SpecPreset {
  /** Stable id for forms and the API (kebab-case). */
  id: string;
  /** Short name for the picker. */
  label: string;
  /** The rule in plain words, e.g. "every harmonic at least 40 dB below the fundamental". */
  summary: string;
  /** Always true: presets are examples to adapt. Kept as a field so every consumer can show it. */
  example: true;
  basis: PresetBasis;
  /** The basis in words: the law's section, or "common practice". */
  basisNote: string;
  /** Where the law's text can be read; only for presets based on law. */
  sourceUrl?: string;
  /** When the number applies (band, power, date); null when it is a general habit of the bench. */
  scope: string | null;
  limitKind: PresetLimitKind;
  /** The fields this preset writes into a spec. */
  spec: PresetSpec;
}

const CFR_97_307_URL = "https://www.ecfr.gov/current/title-47/chapter-I/subchapter-D/part-97/subpart-D/section-97.307";

/**
 * The safety note shown with the presets (and in the footer): what a limit preset can and cannot tell.
 */
export const EMISSIONS_SAFETY_NOTE =
  "These limits are examples to adapt, not a compliance test. Local regulations and codes govern radiated emission " +
  "limits, licensing and mains-powered equipment wherever a build is used; a bench capture measures the oscillator's " +
  "output, not what an antenna radiates or what the rules count as a spurious emission.";

/** The presets in the order the picker lists them (loosest harmonic limit first, then frequency). */
export const SPEC_PRESETS: readonly SpecPreset[] = Object.freeze([
  {
    id: "raw-lc-unfiltered",
    label: "Raw LC, unfiltered",
    summary: "every harmonic at least 20 dB below the fundamental",
    example: true,
    basis: "practice",
    basisNote: "common practice for a free-running LC stage with no output filter",
    scope: null,
    limitKind: "per-harmonic-dbc",
    spec: { maxHarmonicDbc: -20 },
  },
  {
    id: "bench",
    label: "Bench",
    summary: "every harmonic at least 30 dB below the fundamental",
    example: true,
    basis: "practice",
    basisNote: "common practice for bench signal sources (a published generator manual quotes −30 dBc below 100 MHz)",
    scope: null,
    limitKind: "per-harmonic-dbc",
    spec: { maxHarmonicDbc: -30 },
  },
  {
    id: "clean",
    label: "Clean",
    summary: "harmonics at least 40 dB below the fundamental",
    example: true,
    basis: "practice",
    basisNote: "common practice for a filtered, clean oscillator output",
    scope: null,
    limitKind: "per-harmonic-dbc",
    spec: { maxHarmonicDbc: -40 },
  },
  {
    id: "us-amateur-hf-post-2003",
    label: "US amateur HF, post-2003 transmitter",
    summary: "every spurious emission at least 43 dB below the fundamental's mean power",
    example: true,
    basis: "law",
    basisNote: "47 CFR §97.307(d)",
    sourceUrl: CFR_97_307_URL,
    scope:
      "US amateur service, below 30 MHz, transmitter installed after 1 January 2003; applies to the transmitter's " +
      "emissions, of which the harmonics checked here are only a part",
    limitKind: "per-harmonic-dbc",
    spec: { maxHarmonicDbc: -43 },
  },
  {
    id: "us-amateur-vhf-over-25w",
    label: "US amateur VHF over 25 W",
    summary: "every spurious emission at least 60 dB below the fundamental's mean power",
    example: true,
    basis: "law",
    basisNote: "47 CFR §97.307(e)",
    sourceUrl: CFR_97_307_URL,
    scope:
      "US amateur service, 30–225 MHz, mean power above 25 W (at 25 W or less the rule is different: at most 25 µW " +
      "and at least 40 dB below)",
    limitKind: "per-harmonic-dbc",
    spec: { maxHarmonicDbc: -60 },
  },
  {
    id: "frequency-half-percent",
    label: "Frequency within ±0.5 %",
    summary: "measured frequency within ±0.5 % of the target",
    example: true,
    basis: "practice",
    basisNote: "common practice for a trimmed LC oscillator (a value from memory, not from a standard)",
    scope: null,
    limitKind: "frequency-tolerance",
    spec: { toleranceValue: 0.5, toleranceUnit: "percent" },
  },
  // Stability examples. None is a standard's figure: each is a round number from bench habit, to adapt.
  {
    id: "bench-clock-jitter",
    label: "Bench clock jitter",
    summary: "rms jitter of each capture at most 1 ns",
    example: true,
    basis: "practice",
    basisNote: "common practice for a free-running LC clock that times other bench equipment (a value from memory, not from a standard)",
    scope: null,
    limitKind: "rms-jitter-s",
    spec: { maxRmsJitterS: 1e-9 },
  },
  {
    id: "lc-vfo-phase-noise",
    label: "LC VFO phase noise",
    summary: "phase noise at most −100 dBc/Hz at 10 kHz from the carrier",
    example: true,
    basis: "practice",
    basisNote: "common practice for a general-purpose discrete LC VFO (a value from memory, not from a standard)",
    scope: "judged only where a capture has an estimate at 10 kHz (a record of at least a few tenths of a millisecond)",
    limitKind: "phase-noise-dbc-hz",
    spec: { phaseNoiseOffsetHz: 10_000, maxPhaseNoiseDbcPerHz: -100 },
  },
  {
    id: "start-up-10-ms",
    label: "Starts within 10 ms",
    summary: "start-up to 90 % of the settled amplitude within 10 ms",
    example: true,
    basis: "practice",
    basisNote: "common practice for a clock that must run before the circuit it drives leaves reset (a value from memory)",
    scope: "judged only on captures that show a start-up (taken from power-on)",
    limitKind: "start-up-s",
    spec: { maxStartUpS: 0.01 },
  },
  {
    id: "regulated-supply-pushing",
    label: "Pushing on a regulated supply",
    summary: "frequency moves at most 50 ppm per volt of supply",
    example: true,
    basis: "practice",
    basisNote: "common practice for a discrete LC stage whose transistor capacitances move with bias (a value from memory, not from a standard)",
    scope: "judged across the build's runs at several supply voltages",
    limitKind: "pushing-ppm-per-v",
    spec: { maxPushingPpmPerV: 50 },
  },
  {
    id: "c0g-tank-tempco",
    label: "C0G tank tempco",
    summary: "temperature coefficient at most 50 ppm/K in size",
    example: true,
    basis: "practice",
    basisNote: "common practice for a tank of C0G capacitors (0 ± 30 ppm/K) and a stable inductor (a value from memory)",
    scope: "judged across the build's runs at several temperatures",
    limitKind: "tempco-ppm-per-k",
    spec: { maxTempcoPpmPerK: 50 },
  },
] satisfies SpecPreset[]);

/**
 * One preset by id.
 * @param id - a preset id from {@link SPEC_PRESETS}
 * @returns the preset
 * @throws RangeError naming the known ids when `id` is not one of them
 */
export function getSpecPreset(id: string): SpecPreset {
  const preset = SPEC_PRESETS.find((p) => p.id === id);
  if (!preset) {
    throw new RangeError(`spec preset must be one of ${SPEC_PRESETS.map((p) => p.id).join(", ")}; got ${JSON.stringify(id)}`);
  }
  return preset;
}

/**
 * Writes a preset's limits into a spec, keeping everything the preset does not set (the target frequency, the
 * other limits). The result is a new object; the input is not changed.
 * @param spec - the spec being edited
 * @param id - a preset id
 * @returns the spec with the preset's fields replaced
 * @throws RangeError when `id` is not a preset
 */
export function applySpecPreset(spec: DesignSpec, id: string): DesignSpec {
  return { ...spec, ...getSpecPreset(id).spec };
}

/**
 * The presets whose every field the spec currently equals, so the form can show which example it started from.
 * @param spec - a spec
 * @returns the matching presets' ids, in picker order (possibly several: a harmonic preset and the frequency one)
 */
export function matchingPresetIds(spec: DesignSpec): string[] {
  return SPEC_PRESETS.filter((p) =>
    (Object.entries(p.spec) as [keyof PresetSpec, unknown][]).every(([key, value]) => spec[key] === value),
  ).map((p) => p.id);
}
