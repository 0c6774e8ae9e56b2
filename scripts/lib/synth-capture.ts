/**
 * Seeded synthetic oscillator captures with known truth, written as capture CSV.
 * Used by the analysis tests, the benchmark and the demo seed; never by lib/analysis itself.
 */

/** A small, fast, seeded generator (mulberry32) with Gaussian draws (Box–Muller). */
export class SeededRandom {
  private state: number;
  private spare: number | undefined;

  /** @param seed - any 32-bit integer; equal seeds give equal sequences */
  constructor(seed: number) {
    this.state = seed >>> 0;
  }

  /** Uniform in [0, 1). */
  uniform(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Standard normal. */
  normal(): number {
    if (this.spare !== undefined) {
      const value = this.spare;
      this.spare = undefined;
      return value;
    }
    let u = 0;
    while (u === 0) u = this.uniform();
    const v = this.uniform();
    const radius = Math.sqrt(-2 * Math.log(u));
    this.spare = radius * Math.sin(2 * Math.PI * v);
    return radius * Math.cos(2 * Math.PI * v);
  }
}

/** Second channel: the same oscillation seen elsewhere in the loop. */
export interface SynthSecondChannel {
  /** Header name, default "In". */
  name?: string;
  /** Gain of this channel relative to the first, in dB. */
  gainDb: number;
  /** Phase of this channel's fundamental minus the first's, in degrees. */
  phaseDeg: number;
  /** Own noise in V rms (defaults to the first channel's). */
  noiseVrms?: number;
  dcV?: number;
}

/** Everything that shapes a synthetic capture. Only the first four are required. */
export interface SynthCaptureOptions {
  frequencyHz: number;
  sampleRateHz: number;
  samples: number;
  /** Peak amplitude of the fundamental in volts. */
  amplitudeV: number;
  /** Harmonic levels in dBc, for orders 2, 3, … in turn. */
  harmonicsDbc?: number[];
  /** Phases of those harmonics in radians (default: a fixed, arbitrary-looking set). */
  harmonicPhasesRad?: number[];
  /** Phase of the fundamental at t = 0, radians (cosine reference). */
  phaseRad?: number;
  noiseVrms?: number;
  dcV?: number;
  seed?: number;
  /** Start-up transient: the envelope rises as 1 − exp(−t/τ). */
  startupTauS?: number;
  /** Dying oscillation: the envelope falls as exp(−t/τ). */
  decayTauS?: number;
  /** Symmetric clipping level in volts about the DC level (before quantization). */
  clipV?: number;
  /** Frequency change across the record, Hz (linear chirp centred on frequencyHz). */
  driftHz?: number;
  /** Quantize to this many bits over ±fullScaleV. */
  quantizationBits?: number;
  fullScaleV?: number;
  second?: SynthSecondChannel;
  /** Name of the first channel's column, default "Out". */
  channelName?: string;
  timeUnit?: "s" | "ms" | "us" | "µs" | "ns";
  voltageUnit?: "V" | "mV";
  /** Write no time column; the preamble gives the sample interval instead. */
  omitTimeColumn?: boolean;
  delimiter?: "," | ";" | "\t";
  /** Decimal commas (only with a semicolon or tab delimiter). */
  decimalComma?: boolean;
  /** Preamble `key,value` lines; a "Sample Interval" line is added when the time column is omitted. */
  preamble?: Record<string, string>;
  lineEnding?: "\n" | "\r\n";
  byteOrderMark?: boolean;
  /** Digits after the decimal point for voltages (in the file's unit); default 6 for V, 3 for mV. */
  voltageDecimals?: number;
}

/** The sampled truth behind a synthetic capture, in SI units. */
export interface SynthSamples {
  timeS: Float64Array;
  channels: Float64Array[];
  names: string[];
}

const TIME_SCALE = { s: 1, ms: 1e-3, us: 1e-6, "µs": 1e-6, ns: 1e-9 } as const;
const DEFAULT_HARMONIC_PHASES = [0.7, 2.1, -1.3, 0.4, 2.9, -2.2, 1.6, -0.5, 1.1, -2.7, 0.2, 2.4];

/** Column names of the one or two channels. */
function channelNames(options: SynthCaptureOptions): string[] {
  return [options.channelName ?? "Out", options.second?.name ?? "In"].slice(0, options.second ? 2 : 1);
}

function harmonicAmplitudes(options: SynthCaptureOptions): number[] {
  return (options.harmonicsDbc ?? []).map((dbc) => options.amplitudeV * 10 ** (dbc / 20));
}

/**
 * Fills `out[0..count)` with samples `first..first+count` of channel `channelIndex` (0 or 1).
 * Computing in blocks keeps a 10-million-sample file from living in memory while it is written.
 */
function fillBlock(
  options: SynthCaptureOptions,
  random: SeededRandom,
  first: number,
  count: number,
  out: Float64Array[],
): void {
  const fs = options.sampleRateHz;
  const recordS = options.samples / fs;
  const harmonics = harmonicAmplitudes(options);
  const phases = options.harmonicPhasesRad ?? DEFAULT_HARMONIC_PHASES;
  const phase0 = options.phaseRad ?? 0.3;
  const drift = options.driftHz ?? 0;
  const second = options.second;
  const gain2 = second ? 10 ** (second.gainDb / 20) : 0;
  const phase2 = second ? (second.phaseDeg * Math.PI) / 180 : 0;
  const step = options.quantizationBits ? (2 * (options.fullScaleV ?? options.amplitudeV * 1.25)) / 2 ** options.quantizationBits : 0;
  const noise1 = options.noiseVrms ?? 0;
  const noise2 = second?.noiseVrms ?? noise1;
  for (let j = 0; j < count; j++) {
    const t = (first + j) / fs;
    // Linear chirp centred on frequencyHz: f(t) = f0 + drift·(t/T − ½).
    const phase = 2 * Math.PI * (options.frequencyHz * t + (drift * (t * t - t * recordS)) / (2 * recordS)) + phase0;
    let envelope = 1;
    if (options.startupTauS) envelope *= 1 - Math.exp(-t / options.startupTauS);
    if (options.decayTauS) envelope *= Math.exp(-t / options.decayTauS);
    let wave1 = Math.cos(phase);
    let wave2 = Math.cos(phase + phase2);
    for (let h = 0; h < harmonics.length; h++) {
      const order = h + 2;
      const hp = phases[h % phases.length];
      wave1 += (harmonics[h] / options.amplitudeV) * Math.cos(order * phase + hp);
      wave2 += (harmonics[h] / options.amplitudeV) * Math.cos(order * (phase + phase2) + hp);
    }
    const values = [
      (options.dcV ?? 0) + envelope * options.amplitudeV * wave1 + noise1 * random.normal(),
      (second?.dcV ?? 0) + envelope * options.amplitudeV * gain2 * wave2 + (second ? noise2 * random.normal() : 0),
    ];
    for (let k = 0; k < out.length; k++) {
      let v = values[k];
      if (options.clipV !== undefined) {
        const dc = k === 0 ? (options.dcV ?? 0) : (second?.dcV ?? 0);
        v = Math.min(dc + options.clipV, Math.max(dc - options.clipV, v));
      }
      if (step > 0) v = Math.round(v / step) * step;
      out[k][j] = v;
    }
  }
}

/**
 * Samples a synthetic capture in memory (for tests that bypass the CSV).
 * @returns time in seconds and one or two channels in volts
 */
export function synthSamples(options: SynthCaptureOptions): SynthSamples {
  const channelCount = options.second ? 2 : 1;
  const channels = Array.from({ length: channelCount }, () => new Float64Array(options.samples));
  fillBlock(options, new SeededRandom(options.seed ?? 1), 0, options.samples, channels);
  const timeS = Float64Array.from({ length: options.samples }, (_, i) => i / options.sampleRateHz);
  return { timeS, channels, names: channelNames(options) };
}

/**
 * Writes a synthetic capture as CSV text, in pieces of about `blockRows` rows, so a 10-million-row
 * file can be streamed to disk without building one string.
 */
export function* synthCaptureChunks(options: SynthCaptureOptions, blockRows = 16384): Generator<string> {
  const delimiter = options.delimiter ?? ",";
  const eol = options.lineEnding ?? "\n";
  const decimalComma = options.decimalComma === true && delimiter !== ",";
  const timeUnit = options.timeUnit ?? "s";
  const voltageUnit = options.voltageUnit ?? "V";
  const voltScale = voltageUnit === "mV" ? 1e3 : 1;
  const decimals = options.voltageDecimals ?? (voltageUnit === "mV" ? 3 : 6);
  const fix = decimalComma ? (text: string) => text.replace(".", ",") : (text: string) => text;
  const channelCount = options.second ? 2 : 1;
  const names = channelNames(options);

  const preamble: Record<string, string> = { ...(options.preamble ?? {}) };
  if (options.omitTimeColumn) preamble["Sample Interval"] = fix(String(1 / options.sampleRateHz));
  let head = options.byteOrderMark ? "\ufeff" : "";
  for (const [key, value] of Object.entries(preamble)) head += `${key}${delimiter}${value}${eol}`;
  const headers = names.map((name) => `${name} (${voltageUnit})`);
  if (!options.omitTimeColumn) headers.unshift(`Time (${timeUnit})`);
  head += headers.join(delimiter) + eol;
  yield head;

  const random = new SeededRandom(options.seed ?? 1);
  const block = Array.from({ length: channelCount }, () => new Float64Array(blockRows));
  const timeFactor = 1 / (options.sampleRateHz * TIME_SCALE[timeUnit]);
  for (let first = 0; first < options.samples; first += blockRows) {
    const count = Math.min(blockRows, options.samples - first);
    fillBlock(options, random, first, count, block);
    const lines: string[] = new Array(count);
    for (let j = 0; j < count; j++) {
      let line = options.omitTimeColumn ? "" : fix(((first + j) * timeFactor).toExponential(9)) + delimiter;
      for (let k = 0; k < channelCount; k++) {
        if (k > 0) line += delimiter;
        line += fix((block[k][j] * voltScale).toFixed(decimals));
      }
      lines[j] = line;
    }
    yield lines.join(eol) + eol;
  }
}

/** The whole synthetic capture as one CSV string (small captures only). */
export function synthCaptureCsv(options: SynthCaptureOptions): string {
  return Array.from(synthCaptureChunks(options)).join("");
}
