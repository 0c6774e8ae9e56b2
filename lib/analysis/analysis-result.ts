import type { TimeSource } from "./csv-import";
import type { FrequencyUncertainty } from "./frequency-uncertainty";
import type { Harmonic } from "./harmonic-report";
import type { PlotData } from "./plot";
import type { Spur } from "./spurs";
import type { StabilityResult } from "./stability/types";
import type { GainPhase } from "./two-channel";
import type { AnalysisWarning } from "./warnings";

export type { Harmonic, HarmonicStatus } from "./harmonic-report";
export type { Spur, SpurKind } from "./spurs";
export type { FrequencyUncertainty } from "./frequency-uncertainty";
export type { StabilityResult } from "./stability/types";

/** THD's status and floor, as stored with the result. */
export interface ThdSummary {
  status: "measured" | "below-floor" | "not-measurable";
  /** What the undetected orders could add at most, %. */
  floorPercent: number;
  /** Upper bound the record supports: √(THD² + floor²), % (null when not measurable). */
  upperBoundPercent: number | null;
  detectedOrders: number[];
  note: string | null;
  /** Lowest sample rate that keeps every requested order apart (below half of it), S/s; null when this one does. */
  neededSampleRateHz: number | null;
}


/** The second channel against the analysed one, at the fundamental. */
export interface TwoChannelResult extends GainPhase {
  /** The analysed channel (the reference). */
  referenceChannel: string;
  /** The channel compared with it. */
  channel: string;
}

/** How the figures were obtained, for the run's record. */
export interface AnalysisMethod {
  spectrum: string;
  frequency: string;
  harmonics: string;
  noise: string;
}

/**
 * The numbers of one capture's analysis, in SI units (Hz, V, s; dB where named). Serialisable to
 * JSON as it stands: a dB figure that would be infinite is null.
 */
export interface AnalysisResult {
  engineVersion: string;
  /** Name of the analysed channel. */
  channel: string;
  samples: number;
  sampleRateHz: number;
  recordS: number;
  /** Fundamental frequency from the four-parameter sine fit. */
  frequencyHz: number;
  /**
   * Statistical 1σ of frequencyHz: the fit residual's white-noise share, root-sum-squared with the
   * oscillator's frequency noise where the segment scatter shows it (the instrument's timebase is
   * not in it; see `uncertainty`).
   */
  frequencyUncertaintyHz: number;
  uncertainty: FrequencyUncertainty;
  fundamentalVpk: number;
  /** Phase of the fundamental at the first sample, radians (cosine reference). */
  fundamentalPhaseRad: number;
  vpp: number;
  /** Total rms, DC included. */
  vrms: number;
  /** DC offset from the least-squares fit (unbiased by a fractional last period, unlike the mean). */
  dcV: number;
  /** Plain mean of the samples. */
  meanV: number;
  minV: number;
  maxV: number;
  /**
   * THD relative to the fundamental over the detected orders, in %; null when it cannot be stated
   * (an order not separable, or no order above the noise: see `thd`).
   */
  thdPercent: number | null;
  thdDb: number | null;
  /** THD relative to the total rms of fundamental and harmonics, in %; null with thdPercent. */
  thdRPercent: number | null;
  /** How THD was obtained, its noise floor and why it may be missing. */
  thd: ThdSummary;
  sinadDb: number | null;
  snrDb: number | null;
  sfdrDb: number | null;
  /** Effective number of bits, (SINAD − 1.76)/6.02: meaningful for a full-scale sine only. */
  enob: number | null;
  /** rms of what is left after DC, fundamental and harmonics are fitted out. */
  noiseVrms: number;
  /** Highest order asked for (the list holds every order 2..this, folded or not). */
  harmonicOrdersRequested: number;
  harmonics: Harmonic[];
  /** The largest non-harmonic components, named (sub-harmonic, second mode, mains, intermodulation, other). */
  spurs: Spur[];
  /** The component SFDR is measured against: the largest measured harmonic or spur. */
  largestSpur: Spur | null;
  /** Whether the fitted tone stands above the rest of the record. */
  tone: { statistic: number; threshold: number; toneOverRestDb: number | null; detected: boolean; dominant: boolean };
  cycles: number;
  samplesPerCycle: number;
  /**
   * Frequency of the first and last thirds of the record (distortion removed), for a spec that limits the drift
   * within one capture; null when the record holds too few periods to fit its thirds.
   */
  inRecordDrift: InRecordDrift | null;
  warnings: AnalysisWarning[];
  /**
   * Phase noise, jitter, period jitter, Allan deviation and start-up or ring-down (engine ≥ 1.3.0).
   * Results stored by an older engine have none: read its absence as "not measured".
   */
  stability?: StabilityResult;
  twoChannel: TwoChannelResult | null;
  /** Preamble metadata of the file, when the result came from a capture. */
  metadata: Record<string, string>;
  /** Voltage channels the file holds. */
  channels: string[];
  timeSource: TimeSource | "samples";
  method: AnalysisMethod;
}

/** The in-record drift check's figures: last third minus first third, relative to the first, in ppm. */
export interface InRecordDrift {
  firstThirdHz: number;
  lastThirdHz: number;
  ppm: number;
  /** |difference| in combined standard deviations of the two fits; null when both fits are exact (no noise). */
  sigmas: number | null;
}

/** Wall time of each stage, milliseconds (only when asked for). */
export interface AnalysisTimings {
  statsMs: number;
  fftMs: number;
  fitMs: number;
  harmonicsMs: number;
  checksMs: number;
  twoChannelMs: number;
  plotMs: number;
}

/** What {@link analyzeCapture} returns: the numbers, and the plot data kept apart so JSON output can leave it out. */
export interface CaptureAnalysis {
  result: AnalysisResult;
  /** Plot data (empty arrays when `plot: false` was asked for). */
  plot: PlotData;
  timings?: AnalysisTimings;
}

