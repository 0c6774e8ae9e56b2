/** Where the sampling clock of a capture without a time column came from. */
export interface PreambleTiming {
  /** Key of the preamble line that gave the figure, as written. */
  key: string;
  sampleIntervalS: number;
}

const INTERVAL_KEY = /(sampl\w*|time|x)[\s_-]*(interval|increment|step|period)|^\s*(dt|delta\s*t|xinc(rement)?)\s*$/i;
const RATE_KEY = /(sampl\w*)[\s_-]*(rate|frequency|freq)|^\s*(fs|srate)\s*$/i;

const INTERVAL_UNIT: Record<string, number> = {
  "": 1,
  s: 1,
  ms: 1e-3,
  us: 1e-6,
  "\u00b5s": 1e-6,
  "\u03bcs": 1e-6,
  ns: 1e-9,
  ps: 1e-12,
};

// Rates are written "Hz", "kHz", "MSa/s", "GS/s"… Strip the per-second spelling, then read the prefix.
const RATE_PREFIX: Record<string, number> = { "": 1, k: 1e3, m: 1e6, g: 1e9 };

const NUMBER_WITH_UNIT = /^\s*([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*([^\d\s].*?)?\s*$/;

function readNumberAndUnit(value: string): { value: number; unit: string } | undefined {
  const match = NUMBER_WITH_UNIT.exec(value);
  if (!match) return undefined;
  const number = Number(match[1].replace(",", "."));
  if (!Number.isFinite(number)) return undefined;
  return { value: number, unit: (match[2] ?? "").trim() };
}

function rateScale(unit: string): number | undefined {
  const bare = unit.replace(/\s+/g, "");
  // "MHz" must stay mega and "mHz" milli is never a sample rate, so the prefix test ignores case.
  const perSecond = /^([kKmMgG]?)(hz|sa\/s|s\/s|sps|samples\/s)$/i.exec(bare);
  if (bare === "") return 1;
  if (!perSecond) return undefined;
  return RATE_PREFIX[perSecond[1].toLowerCase()];
}

/**
 * Finds the sample interval in a capture's preamble metadata, from a sample-interval line
 * (`Sample Interval,1e-6`, `dt,2 us`) or a sample-rate line (`Sample Rate,1 MSa/s`).
 *
 * @param metadata - preamble key → value, in file order
 * @returns the interval in seconds and the key it came from, or undefined when the preamble gives
 *   neither figure (or gives one that is not a positive number with a known unit)
 */
export function findPreambleTiming(metadata: Record<string, string>): PreambleTiming | undefined {
  for (const [key, raw] of Object.entries(metadata)) {
    if (INTERVAL_KEY.test(key)) {
      const parsed = readNumberAndUnit(raw);
      const scale = parsed && INTERVAL_UNIT[parsed.unit.toLowerCase()];
      if (parsed && scale !== undefined && parsed.value > 0) {
        return { key, sampleIntervalS: parsed.value * scale };
      }
    } else if (RATE_KEY.test(key)) {
      const parsed = readNumberAndUnit(raw);
      const scale = parsed && rateScale(parsed.unit);
      if (parsed && scale !== undefined && parsed.value > 0) {
        return { key, sampleIntervalS: 1 / (parsed.value * scale) };
      }
    }
  }
  return undefined;
}
