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
 * Spectral peaks away from DC, the fundamental and the harmonics' (folded) positions: local maxima
 * over a window's main lobe, standing well above the median bin, with frequency and level from a
 * parabola through the log magnitudes (which also undoes most of the scallop loss).
 */
/** Bins within a main lobe (plus one bin) of each listed frequency, and that guard width in bins. */
function excludedBins(spectrum: Spectrum, excludedHz: readonly number[]): { excluded: Uint8Array; guard: number } {
  const padding = spectrum.fftLength / spectrum.segmentLength;
  const guard = Math.ceil((spectrum.lobeHalfWidthBins + 1) * padding);
  const excluded = new Uint8Array(spectrum.amplitudeVpk.length);
  for (const hz of excludedHz) {
    const centre = hz / spectrum.binHz;
    const lo = Math.max(0, Math.floor(centre) - guard);
    const hi = Math.min(excluded.length - 1, Math.ceil(centre) + guard);
    for (let k = lo; k <= hi; k++) excluded[k] = 1;
  }
  return { excluded, guard };
}

function findPeaks(spectrum: Spectrum, excludedHz: readonly number[]): Peak[] {
  const a = spectrum.amplitudeVpk;
  const { excluded, guard } = excludedBins(spectrum, excludedHz);
  const threshold = PEAK_OVER_MEDIAN * spectrum.medianAmplitudeVpk;
  const peaks: Peak[] = [];
  for (let k = 1; k < a.length - 1; k++) {
    if (excluded[k] || !(a[k] > threshold)) continue;
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

/** The largest peak left once the listed components are excluded: noise, when nothing else is there. */
export function largestOtherBin(spectrum: Spectrum, excludedHz: readonly number[]): Peak | null {
  const a = spectrum.amplitudeVpk;
  const { excluded } = excludedBins(spectrum, excludedHz);
  let best = -1;
  for (let k = 0; k < a.length; k++) if (!excluded[k] && (best < 0 || a[k] > a[best])) best = k;
  return best >= 0 ? { frequencyHz: best * spectrum.binHz, amplitudeVpk: a[best] } : null;
}

interface Candidate {
  hz: number;
  kind: SpurKind;
  label: string;
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
 * The largest non-harmonic components of a record, each named by what it most likely is: a
 * sub-harmonic (f/2, f/3 and their odd multiples: period doubling, squegging), mains and its
 * multiples, a second mode (the largest other tone within 30 dB of the fundamental), its
 * intermodulation with the fundamental (m·f1 ± n·f2, m ≤ 3, n ≤ 3), or other. A spur matches a
 * candidate within 1.5 of the record's resolution bins (fs / segment length).
 *
 * @param spectrum - the record's windowed spectrum
 * @param fundamentalHz - the fitted fundamental
 * @param fundamentalVpk - its fitted amplitude
 * @param harmonicSeenAtHz - where each harmonic is seen (folded), measured or not
 * @param maxOrder - the highest harmonic order asked for
 * @returns at most {@link MAX_SPURS} spurs, largest first
 */
export function findSpurs(
  spectrum: Spectrum,
  fundamentalHz: number,
  fundamentalVpk: number,
  harmonicSeenAtHz: readonly number[],
  maxOrder: number,
): Spur[] {
  const fs = spectrum.sampleRateHz;
  const peaks = findPeaks(spectrum, [0, fold(fundamentalHz, fs), ...harmonicSeenAtHz]).slice(0, 4 * MAX_SPURS);
  const resolutionHz = fs / spectrum.segmentLength;
  const toleranceHz = 1.5 * resolutionHz;
  const dbc = (vpk: number) => {
    const value = amplitudeRatioToDb(vpk / fundamentalVpk);
    return Number.isFinite(value) ? value : null;
  };
  const fixedCandidates = [
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
