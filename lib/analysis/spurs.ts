import { amplitudeRatioToDb } from "./metrics";
import type { Spectrum } from "./spectrum";

/** What a spectral component other than the fundamental most likely is. */
export type SpurKind = "harmonic" | "sub-harmonic" | "second-mode" | "mains" | "intermodulation" | "other";

/** A component of the record other than DC and the fundamental. */
export interface Spur {
  /** Interpolated frequency where the record shows it (folded into [0, fs/2]), Hz. */
  frequencyHz: number;
  amplitudeVpk: number;
  dBc: number | null;
  kind: SpurKind;
  /** Which component it is, in a few words: "harmonic 3", "f/2", "50 Hz mains × 3", "2·f1 − f2". */
  label: string;
}

/** Most spurs listed per record. */
export const MAX_SPURS = 6;
/** A peak counts as a spur when it stands this many times above the spectrum's median bin (26 dB). */
const PEAK_OVER_MEDIAN = 20;
/** A non-harmonic tone this close to the fundamental is called a second mode, dBc. */
const SECOND_MODE_DBC = -30;
const MAINS_HZ = [50, 60];
const MAINS_MULTIPLES = 40;

function fold(frequencyHz: number, sampleRateHz: number): number {
  const r = ((frequencyHz % sampleRateHz) + sampleRateHz) % sampleRateHz;
  return r <= sampleRateHz / 2 ? r : sampleRateHz - r;
}

interface Peak {
  frequencyHz: number;
  amplitudeVpk: number;
}

/**
 * A component whose own main lobe is left out of the spur search: at `hz`, and with bins up to
 * `uptoVpk` taken for its lobe (Infinity: every bin there). A bin above that is another tone beside
 * it — a second mode a few bins from a harmonic the fit found under the noise, say — and is kept.
 */
export interface KnownComponent {
  hz: number;
  uptoVpk: number;
}

// A window reads a tone at most at its amplitude (centred on a bin); twice that leaves room for the
// noise on top of the lobe.
const OWN_LOBE_MARGIN = 2;

/**
 * Per bin, the level up to which it is taken for a known component's main lobe (plus one bin; 0
 * away from them), and that guard width in bins.
 */
function excludedBins(spectrum: Spectrum, known: readonly KnownComponent[]): { upto: Float64Array; guard: number } {
  const padding = spectrum.fftLength / spectrum.segmentLength;
  const guard = Math.ceil((spectrum.lobeHalfWidthBins + 1) * padding);
  const upto = new Float64Array(spectrum.amplitudeVpk.length);
  for (const { hz, uptoVpk } of known) {
    const centre = hz / spectrum.binHz;
    const lo = Math.max(0, Math.floor(centre) - guard);
    const hi = Math.min(upto.length - 1, Math.ceil(centre) + guard);
    for (let k = lo; k <= hi; k++) upto[k] = Math.max(upto[k], uptoVpk);
  }
  return { upto, guard };
}

/**
 * Spectral peaks away from DC, the fundamental and the harmonics' (folded) lobes: local maxima over
 * a window's main lobe, standing well above the median bin, with frequency and level from a
 * parabola through the log magnitudes (which also undoes most of the scallop loss).
 */
function findPeaks(spectrum: Spectrum, known: readonly KnownComponent[]): Peak[] {
  const a = spectrum.amplitudeVpk;
  const { upto, guard } = excludedBins(spectrum, known);
  const threshold = PEAK_OVER_MEDIAN * spectrum.medianAmplitudeVpk;
  const peaks: Peak[] = [];
  for (let k = 1; k < a.length - 1; k++) {
    if (!(a[k] > upto[k]) || !(a[k] > threshold)) continue;
    let isMax = true;
    for (let j = Math.max(0, k - guard); j <= Math.min(a.length - 1, k + guard) && isMax; j++) {
      if (a[j] > a[k] || (a[j] === a[k] && j < k)) isMax = false;
    }
    if (!isMax) continue;
    const left = Math.log(Math.max(a[k - 1], 1e-300));
    const centre = Math.log(a[k]);
    const right = Math.log(Math.max(a[k + 1], 1e-300));
    const denominator = left - 2 * centre + right;
    const delta = denominator < 0 ? Math.max(-0.5, Math.min(0.5, (0.5 * (left - right)) / denominator)) : 0;
    peaks.push({ frequencyHz: (k + delta) * spectrum.binHz, amplitudeVpk: Math.exp(centre - 0.25 * (left - right) * delta) });
  }
  return peaks.sort((p, q) => q.amplitudeVpk - p.amplitudeVpk);
}

/** The largest bin left once the known components' lobes are excluded: noise, when nothing else is there. */
export function largestOtherBin(spectrum: Spectrum, known: readonly KnownComponent[]): Peak | null {
  const a = spectrum.amplitudeVpk;
  const { upto } = excludedBins(spectrum, known);
  let best = -1;
  for (let k = 0; k < a.length; k++) if (a[k] > upto[k] && (best < 0 || a[k] > a[best])) best = k;
  return best >= 0 ? { frequencyHz: best * spectrum.binHz, amplitudeVpk: a[best] } : null;
}

/**
 * The components the spur search leaves out: DC and the fundamental whole, and each harmonic's lobe
 * up to twice its level — its fitted amplitude when measured, its detection limit when under the
 * noise, the whole lobe when it could not be separated (its level is not known).
 */
export function knownComponents(
  fundamentalHz: number,
  fundamentalVpk: number,
  sampleRateHz: number,
  harmonics: readonly { seenAtHz: number; amplitudeVpk: number | null; detectionLimitDbc: number | null }[],
): KnownComponent[] {
  const harmonicLobes = harmonics.map((h) => {
    const levelVpk = h.amplitudeVpk ?? (h.detectionLimitDbc === null ? Infinity : fundamentalVpk * 10 ** (h.detectionLimitDbc / 20));
    return { hz: h.seenAtHz, uptoVpk: OWN_LOBE_MARGIN * levelVpk };
  });
  return [{ hz: 0, uptoVpk: Infinity }, { hz: fold(fundamentalHz, sampleRateHz), uptoVpk: Infinity }, ...harmonicLobes];
}

interface Candidate {
  hz: number;
  kind: SpurKind;
  label: string;
}

// Orders above those asked for are still harmonics (a square wave's 11th stands at −21 dBc): named so
// up to this many times the orders asked for, and at least to this order.
const HIGHER_HARMONIC_FACTOR = 4;
const HIGHER_HARMONIC_MIN_ORDER = 40;

function higherHarmonicCandidates(fundamentalHz: number, sampleRateHz: number, maxOrder: number): Candidate[] {
  const out: Candidate[] = [];
  const top = Math.max(HIGHER_HARMONIC_MIN_ORDER, HIGHER_HARMONIC_FACTOR * maxOrder);
  for (let h = maxOrder + 1; h <= top; h++) {
    out.push({ hz: fold(h * fundamentalHz, sampleRateHz), kind: "harmonic", label: `harmonic ${h} (beyond order ${maxOrder})` });
  }
  return out;
}

function subHarmonicCandidates(fundamentalHz: number, sampleRateHz: number, maxOrder: number): Candidate[] {
  const out: Candidate[] = [];
  for (const q of [2, 3]) {
    for (let p = 1; p <= maxOrder * q; p++) {
      if (p % q === 0) continue;
      out.push({ hz: fold((p * fundamentalHz) / q, sampleRateHz), kind: "sub-harmonic", label: p === 1 ? `f/${q}` : `${p}f/${q}` });
    }
  }
  return out;
}

function mainsCandidates(sampleRateHz: number): Candidate[] {
  const out: Candidate[] = [];
  for (const base of MAINS_HZ) {
    for (let k = 1; k <= MAINS_MULTIPLES; k++) {
      out.push({ hz: fold(k * base, sampleRateHz), kind: "mains", label: k === 1 ? `${base} Hz mains` : `${base} Hz mains × ${k}` });
    }
  }
  return out;
}

function intermodCandidates(f1: number, f2: number, sampleRateHz: number): Candidate[] {
  const out: Candidate[] = [];
  for (let m = 0; m <= 3; m++) {
    for (let n = 1; n <= 3; n++) {
      if (m === 0 && n === 1) continue;
      const mf = m === 0 ? "" : m === 1 ? "f1" : `${m}·f1`;
      const nf = n === 1 ? "f2" : `${n}·f2`;
      if (m === 0) out.push({ hz: fold(n * f2, sampleRateHz), kind: "intermodulation", label: nf });
      else {
        out.push({ hz: fold(m * f1 + n * f2, sampleRateHz), kind: "intermodulation", label: `${mf} + ${nf}` });
        out.push({ hz: fold(Math.abs(m * f1 - n * f2), sampleRateHz), kind: "intermodulation", label: `${mf} − ${nf}` });
      }
    }
  }
  return out;
}

function nearest(candidates: readonly Candidate[], hz: number, toleranceHz: number): Candidate | undefined {
  let best: Candidate | undefined;
  for (const c of candidates) {
    if (Math.abs(c.hz - hz) <= toleranceHz && (!best || Math.abs(c.hz - hz) < Math.abs(best.hz - hz))) best = c;
  }
  return best;
}

/**
 * The largest components of a record besides the fundamental and the harmonics it measured, each
 * named by what it most likely is: a harmonic above the orders asked for, a sub-harmonic (f/2, f/3
 * and their odd multiples: period doubling, squegging), mains and its multiples, a second mode (the
 * largest other tone within 30 dB of the fundamental), its intermodulation with the fundamental
 * (m·f1 ± n·f2, m ≤ 3, n ≤ 3), or other. A spur matches a candidate within 1.5 of the record's
 * resolution bins (fs / segment length).
 *
 * @param spectrum - the record's windowed spectrum
 * @param fundamentalHz - the fitted fundamental
 * @param fundamentalVpk - its fitted amplitude
 * @param known - what the search leaves out, from {@link knownComponents}
 * @param maxOrder - the highest harmonic order asked for
 * @returns at most {@link MAX_SPURS} spurs, largest first
 */
export function findSpurs(spectrum: Spectrum, fundamentalHz: number, fundamentalVpk: number, known: readonly KnownComponent[], maxOrder: number): Spur[] {
  const fs = spectrum.sampleRateHz;
  const peaks = findPeaks(spectrum, known).slice(0, 4 * MAX_SPURS);
  const resolutionHz = fs / spectrum.segmentLength;
  const toleranceHz = 1.5 * resolutionHz;
  const dbc = (vpk: number) => {
    const value = amplitudeRatioToDb(vpk / fundamentalVpk);
    return Number.isFinite(value) ? value : null;
  };
  const fixedCandidates = [
    ...higherHarmonicCandidates(fundamentalHz, fs, maxOrder),
    ...subHarmonicCandidates(fundamentalHz, fs, maxOrder),
    // Mains lines only mean something when the record resolves them apart (5 Hz between 50 Hz and 60 Hz multiples).
    ...(toleranceHz < 5 ? mainsCandidates(fs) : []),
  ];
  const spurs: Spur[] = [];
  let secondModeHz: number | null = null;
  let intermod: Candidate[] = [];
  for (const peak of peaks) {
    const level = dbc(peak.amplitudeVpk);
    const match = nearest(fixedCandidates, peak.frequencyHz, toleranceHz) ?? nearest(intermod, peak.frequencyHz, toleranceHz);
    if (match) {
      spurs.push({ ...peak, dBc: level, kind: match.kind, label: match.label });
    } else if (secondModeHz === null && level !== null && level > SECOND_MODE_DBC) {
      secondModeHz = peak.frequencyHz;
      intermod = intermodCandidates(fundamentalHz, secondModeHz, fs);
      spurs.push({ ...peak, dBc: level, kind: "second-mode", label: "f2, a second mode" });
    } else {
      spurs.push({ ...peak, dBc: level, kind: "other", label: "unidentified tone" });
    }
    if (spurs.length === MAX_SPURS) break;
  }
  return spurs;
}
