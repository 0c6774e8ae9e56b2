/** Where the sampling clock of a capture without a time column came from. */
export interface PreambleTiming {
  /** Key of the preamble line that gave the figure, as written. */
  key: string;
  sampleIntervalS: number;
}

const INTERVAL_KEY = /(sampl\w*|time|x)[\s_-]*(interval|increment|step|period)|^\s*(dt|delta\s*t|xinc(rement)?)\s*$/i;
const RATE_KEY = /(sampl\w*)[\s_-]*(rate|frequency|freq)|^\s*(fs|srate|sps)\s*$/i;

const INTERVAL_UNIT: Record<string, number> = {
  "": 1,
  s: 1,
  ms: 1e-3,
  us: 1e-6,
  "\u00b5s": 1e-6,
  "\u03bcs": 1e-6,
  ns: 1e-9,
  ps: 1e-12,
  sec: 1,
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
  const perSecond = /^([kKmMgG]?)(hz|sa\/s|s\/s|sps|samples?\/s|(?:sa|s|samples?)\/sec|samples?persecond)$/i.exec(bare);
  if (bare === "") return 1;
  if (!perSecond) return undefined;
  return RATE_PREFIX[perSecond[1].toLowerCase()];
}

// A preamble line without a delimiter is one cell, its key: "Sample Rate: 1 MSa/s", "fs = 1 MHz",
// "Sample interval 1e-6 s". Split it at the first ":" or "=", else where a name is followed by a number.
const INLINE_SEPARATED = /^(.*?[^\s:=])\s*[:=]\s*(\S.*)$/;
const INLINE_NUMBER = /^([A-Za-z][\w ()./-]*?[A-Za-z)])\s+([+-]?(?:\d|[.,]\d).*)$/;

/** The name and the value of a preamble entry, with a value written inside its key taken out of it. */
function nameAndValue(key: string, raw: string): { name: string; value: string } {
  const name = key.trim().replace(/\s*[:=]$/, "");
  if (raw.trim() !== "") return { name, value: raw };
  const inline = INLINE_SEPARATED.exec(key.trim()) ?? INLINE_NUMBER.exec(key.trim());
  return inline ? { name: inline[1].trim(), value: inline[2] } : { name, value: raw };
}

/**
 * Finds the sample interval in a capture's preamble metadata, from a sample-interval line
 * (`Sample Interval,1e-6`, `dt,2 us`, `Sample interval 1e-6 s`) or a sample-rate line (`Sample Rate,1 MSa/s`,
 * `Sample Rate: 1 MSa/s`, `Sampling rate,1e6`, `fs = 1 MHz`). A rate takes Hz, S/s, Sa/s, sps or samples/s with
 * a k, M or G prefix; an interval s, ms, us, µs, ns or ps. The first line that gives a usable figure wins.
 *
 * @param metadata - preamble key → value, in file order
 * @returns the interval in seconds and the key it came from, or undefined when the preamble gives
 *   neither figure (or gives one that is not a positive number with a known unit)
 */
export function findPreambleTiming(metadata: Record<string, string>): PreambleTiming | undefined {
  for (const [key, entry] of Object.entries(metadata)) {
    const { name, value: raw } = nameAndValue(key, entry);
    if (INTERVAL_KEY.test(name)) {
      const parsed = readNumberAndUnit(raw);
      const scale = parsed && INTERVAL_UNIT[parsed.unit.toLowerCase()];
      if (parsed && scale !== undefined && parsed.value > 0) {
        return { key, sampleIntervalS: parsed.value * scale };
      }
    } else if (RATE_KEY.test(name)) {
      const parsed = readNumberAndUnit(raw);
      const scale = parsed && rateScale(parsed.unit);
      if (parsed && scale !== undefined && parsed.value > 0) {
        return { key, sampleIntervalS: 1 / (parsed.value * scale) };
      }
    }
  }
  return undefined;
}
